/**
 * One CSV cell: quoted when it holds a comma, quote or line break; a leading = + - @ is neutralised
 * with an apostrophe so that a spreadsheet does not run it as a formula (CSV injection).
 */
export function csvCell(value: string): string {
  const risky = /^[=+\-@]/.test(value);
  if (!risky && !/[",\n\r]/.test(value)) return value;
  return `"${(risky ? "'" : '') + value.replace(/"/g, '""')}"`;
}
