// The one top-level catch: every error becomes a short message on stderr and an exit code.
import { ApiError, CliError, EXIT_FINDINGS, EXIT_USAGE, messageOf } from './errors.ts';

function write(line: string) {
  process.stderr.write(`${line}\n`);
}

export function reportError(err: unknown): number {
  if (err instanceof CliError) {
    write(`weir: ${err.message}`);
    if (err.hint) write(`  ${err.hint}`);
    return err.exitCode;
  }
  if (err instanceof ApiError) {
    write(`weir: ${describeApiError(err)}`);
    return err.status === 422 ? EXIT_FINDINGS : EXIT_USAGE;
  }
  // Prompts cancelled with Ctrl-C end quietly.
  if ((err as Error)?.name === 'ExitPromptError' || (err as Error)?.name === 'AbortPromptError') {
    write('weir: cancelled');
    return EXIT_USAGE;
  }
  write(`weir: unexpected problem: ${messageOf(err)}`);
  if (process.env.WEIR_DEBUG) write(String((err as Error)?.stack ?? err));
  else write('  (set WEIR_DEBUG=1 to see where it happened, and please report it)');
  return EXIT_USAGE;
}

export function describeApiError(err: ApiError): string {
  switch (err.status) {
    case 401: return `the server did not accept the sign-in (${err.message}); run \`weir login\``;
    case 403: return `not allowed: ${err.message}`;
    case 429: return `too many requests: ${err.message}; wait a little and try again`;
    default: return `the server answered ${err.status} ${err.code}: ${err.message}`;
  }
}
