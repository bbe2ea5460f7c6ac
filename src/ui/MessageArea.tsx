/**
 * The page's message strip: one line tall at all times (so nothing below it moves when a message
 * comes or goes), the newest message on it and the older ones under "n more", which opens over the
 * page. Each message can be dismissed; info messages fade by themselves. Always text nodes.
 */
import { useEffect, useState } from 'react';
import { messageDismiss } from '../state/actionsCore';
import { useBench } from '../state/store';

/** Info messages fade after this long, ms; warnings and errors stay until dismissed. */
const INFO_LIFETIME_MS = 12_000;

export function MessageArea() {
  const messages = useBench((s) => s.messages);
  const [isOpen, setOpen] = useState(false);
  useEffect(() => {
    const timers = messages.filter((m) => m.level === 'info').map((m) => setTimeout(() => messageDismiss(m.id), INFO_LIFETIME_MS));
    return () => timers.forEach(clearTimeout);
  }, [messages]);
  const newestFirst = [...messages].reverse();
  const open = isOpen && messages.length > 1;
  return (
    <div className="messages" aria-live="polite" aria-label="Messages" data-testid="messages" data-count={messages.length}>
      {messages.length > 0 && (
        <div className={`messages-list ${open ? 'open' : ''}`} data-testid="messages-list">
          {newestFirst.map((m) => (
            <div key={m.id} className={`message ${m.level}`} role={m.level === 'error' ? 'alert' : 'status'} title={m.text}>
              <span className="message-level">{m.level === 'error' ? 'Error' : m.level === 'warning' ? 'Note' : 'Info'}</span>
              <span className="message-text">{m.text}</span>
              <button type="button" className="icon" aria-label="Dismiss message" onClick={() => messageDismiss(m.id)}>
                ✕
              </button>
            </div>
          ))}
        </div>
      )}
      {messages.length > 1 && (
        <button type="button" className="messages-more" aria-expanded={open} onClick={() => setOpen(!open)} data-testid="messages-more">
          {open ? 'Fewer' : `${messages.length - 1} more`} ▾
        </button>
      )}
    </div>
  );
}
