/** The page's message area: what happened, in plain words (always text nodes). */
import { messageDismiss } from '../state/actionsCore';
import { useBench } from '../state/store';

export function MessageArea() {
  const messages = useBench((s) => s.messages);
  return (
    <div className="messages" aria-live="polite" aria-label="Messages" data-testid="messages">
      {messages.map((m) => (
        <div key={m.id} className={`message ${m.level}`} role={m.level === 'error' ? 'alert' : 'status'}>
          <span className="message-level">{m.level === 'error' ? 'Error' : m.level === 'warning' ? 'Note' : 'Info'}</span>
          <span className="message-text">{m.text}</span>
          <button type="button" className="icon" aria-label="Dismiss message" onClick={() => messageDismiss(m.id)}>
            ✕
          </button>
        </div>
      ))}
    </div>
  );
}
