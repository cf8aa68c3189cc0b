/** calorbit's version, stamped into every result; test/version.test.ts keeps it equal to package.json. */
export const VERSION = "0.1.0";
