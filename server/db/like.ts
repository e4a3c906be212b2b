/** A LIKE pattern matching `text` anywhere, with its own wildcards escaped ("50%" finds "50%"). */
export const containsPattern = (text: string) => `%${text.replace(/[\\%_]/g, (c) => '\\' + c)}%`;
