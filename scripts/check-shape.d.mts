/** types of scripts/check-shape.mjs for the tests */
export const MAX_LINE: number;
export const MAX_BODY_LINES: number;
export function shapeOffences(files: readonly string[]): string[];
