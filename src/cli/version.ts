/** The version modvet reports (kept equal to package.json's). */
export const VERSION = '0.1.0';
