import { Option } from 'commander';

/** `-f, --format`, the same on every command that can print JSON. */
export const formatOption = (choices: string[] = ['human', 'json']) =>
  new Option('-f, --format <format>', 'output format').choices(choices).default('human');
