/**
 * Project export/import: the whole session as a project file, read back to the same state.
 */
import { projectFileParse, projectFileSerialize } from '../io/projectFile';
import { messagePost } from './actionsCore';
import { sessionOf, stateFromSession } from './session';
import { benchStore } from './store';

/**
 * The current session as project-file text.
 * @param appVersion from package.json
 * @param savedAt ISO 8601 time
 */
export function projectExportText(appVersion: string, savedAt: string = new Date().toISOString()): string {
  return projectFileSerialize(sessionOf(benchStore.getState()), { appVersion, savedAt });
}

/**
 * Replace the session with a project file's content. A file that cannot be read changes nothing.
 * Undo history starts afresh (the project is a new starting point).
 * @returns true when loaded
 */
export function projectImportText(text: string, fileName: string): boolean {
  const r = projectFileParse(text);
  if (!r.ok) {
    messagePost('error', `Could not open ${fileName}: ${r.message}. The current session is unchanged.`);
    return false;
  }
  benchStore.setState(stateFromSession(r.session));
  for (const m of r.messages) messagePost('warning', `${fileName}: ${m}`);
  messagePost('info', `Project ${fileName} opened (${r.session.assignments?.length ?? 0} assignments).`);
  return true;
}
