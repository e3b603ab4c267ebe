/** The "Examples:" block every command shows after its options in --help. */
export const examples = (...lines: string[]): string => `\nExamples:\n${lines.map((l) => `  ${l}`).join('\n')}\n`;
