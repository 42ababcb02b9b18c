// Colour for one output stream. Off when NO_COLOR is set (no-color.org: any non-empty value),
// when --no-color is given, or when the stream is not a terminal, unless FORCE_COLOR asks for it.
import { Chalk, supportsColor, supportsColorStderr, type ChalkInstance } from 'chalk';

export type Colour = ChalkInstance;

export interface ColourOptions {
  /** false when --no-color was given. */
  color?: boolean;
}

export function colourLevel(stream: NodeJS.WriteStream, options: ColourOptions = {}, env: NodeJS.ProcessEnv = process.env): 0 | 1 | 2 | 3 {
  if (options.color === false) return 0;
  if (env.NO_COLOR !== undefined && env.NO_COLOR !== '') return 0;
  const detected = stream === process.stderr ? supportsColorStderr : supportsColor;
  const level = detected ? detected.level : 0;
  if (env.FORCE_COLOR !== undefined && env.FORCE_COLOR !== '0' && env.FORCE_COLOR !== 'false') return level || 1;
  if (!stream.isTTY) return 0;
  return level;
}

export function createColour(stream: NodeJS.WriteStream, options: ColourOptions = {}): Colour {
  return new Chalk({ level: colourLevel(stream, options) });
}
