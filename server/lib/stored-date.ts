/**
 * Dates as Sequelize keeps a DATE column in SQLite: `2026-12-01 09:30:00.000 +00:00`. Statements
 * written by hand (db.sql) store and read the same text, so the models read those rows too.
 */
export const toStoredDate = (d: Date): string => `${d.toISOString().slice(0, 23).replace('T', ' ')} +00:00`;

/** The stored text back as a Date; text without an offset is UTC, as Sequelize reads it. */
export const fromStoredDate = (text: string): Date => new Date(text.includes('+') ? text : `${text} +00:00`);

/**
 * The stored text as ISO 8601 without building a Date, for lists of many rows; text in any other
 * shape (written by an older version, or by hand) goes through Date.
 */
export function storedDateToIso(text: string | null): string | null {
  if (text == null) return null;
  if (text.length === 30 && text.endsWith(' +00:00') && text[10] === ' ') return `${text.slice(0, 10)}T${text.slice(11, 23)}Z`;
  return fromStoredDate(text).toISOString();
}
