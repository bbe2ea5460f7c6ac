/**
 * The page's keyboard map: a key event becomes one action (nothing happens while typing in a field).
 */
import { assignmentDelete, candidateAssign, cursorAssignMatched, cursorStep, cursorStepK, selectionClear } from '../state/actionsAssign';
import { redo, undo, messagePost } from '../state/actionsCore';
import { fitStart } from '../state/actionsFit';
import { viewSet, viewZoomTo } from '../state/actionsView';
import { selectBand } from '../state/selectors';
import { benchStore } from '../state/store';

function isTyping(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  if (!el || !el.tagName) return false;
  const tag = el.tagName.toLowerCase();
  if (tag === 'textarea' || el.isContentEditable) return true;
  if (tag === 'input') {
    const type = (el as HTMLInputElement).type;
    return type !== 'checkbox' && type !== 'radio' && type !== 'button';
  }
  return tag === 'select';
}

/**
 * Handle one keydown.
 * @returns true when the key did something (the caller then prevents the default)
 */
export function keyboardHandle(e: KeyboardEvent): boolean {
  const mod = e.ctrlKey || e.metaKey;
  if (mod && (e.key === 'z' || e.key === 'Z')) {
    if (isTyping(e.target)) return false;
    const label = e.shiftKey ? redo() : undo();
    messagePost('info', label ? `${e.shiftKey ? 'Redone' : 'Undone'}: ${label}.` : e.shiftKey ? 'Nothing to redo.' : 'Nothing to undo.');
    return true;
  }
  if (mod && (e.key === 'y' || e.key === 'Y')) {
    if (isTyping(e.target)) return false;
    const label = redo();
    messagePost('info', label ? `Redone: ${label}.` : 'Nothing to redo.');
    return true;
  }
  if (mod || e.altKey || isTyping(e.target)) return false;
  const s = benchStore.getState();
  switch (e.key) {
    case '?':
      viewSet('isHelpOpen', !s.isHelpOpen);
      return true;
    case 'Escape':
      if (s.isHelpOpen) viewSet('isHelpOpen', false);
      else selectionClear();
      return true;
    case 'ArrowRight':
      cursorStep(1);
      return true;
    case 'ArrowLeft':
      cursorStep(-1);
      return true;
    case 'ArrowUp':
      cursorStepK(1);
      return true;
    case 'ArrowDown':
      cursorStepK(-1);
      return true;
    case 'a':
    case 'A':
    case 'Enter':
      if (s.candidateTarget) candidateAssign(0);
      else cursorAssignMatched();
      return true;
    case 'f':
    case 'F':
      void fitStart();
      return true;
    case 'z':
    case 'Z': {
      if (!s.cursor) return false;
      const b = selectBand(s);
      const i = b.indexOf.get(`${s.cursor.jUpper},${s.cursor.kUpper},${s.cursor.jLower},${s.cursor.kLower}`);
      if (i !== undefined) viewZoomTo(b.lines.wavenumberCm1[i], Math.max(0.3, 3 * Math.abs(s.model.lower.B)));
      return true;
    }
    case 'Delete':
    case 'Backspace':
      if (s.selectedAssignmentId) {
        assignmentDelete([s.selectedAssignmentId]);
        return true;
      }
      return false;
    default:
      if (/^[1-9]$/.test(e.key) && s.candidateTarget) return candidateAssign(Number(e.key) - 1);
      return false;
  }
}
