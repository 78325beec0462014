/** The library file a command or the server opens when none is named (in the working folder). */
export const DEFAULT_LIBRARY_FILE = 'pumpscribe-library.sqlite';
