/** Moved to engine.ts (the one module that knows the database engine); kept so older imports still work. */
export { DataDirError, ensureWritableDir, openDatabase, sqliteHandle } from './engine';
