/** The page's own question before it replaces the user's work (never window.confirm): answers as buttons, Escape cancels. */
import { useEffect, useRef } from 'react';
import { confirmAnswer } from '../state/actionsSession';
import { useBench } from '../state/store';

export function ConfirmPrompt() {
  const request = useBench((s) => s.confirm);
  const first = useRef<HTMLButtonElement>(null);
  useEffect(() => {
    if (request) first.current?.focus();
  }, [request]);
  if (!request) return null;
  return (
    <div className="overlay" onClick={(e) => e.target === e.currentTarget && confirmAnswer(null)}>
      <div
        className="overlay-card confirm-card"
        role="alertdialog"
        aria-modal="true"
        aria-labelledby="confirm-title"
        aria-describedby="confirm-text"
        data-testid="confirm"
        onKeyDown={(e) => {
          e.stopPropagation();
          if (e.key === 'Escape') confirmAnswer(null);
        }}
      >
        <h2 id="confirm-title">{request.title}</h2>
        <p id="confirm-text">{request.text}</p>
        <div className="confirm-actions">
          {request.choices.map((c, i) => (
            <button
              key={c.id}
              ref={i === 0 ? first : undefined}
              type="button"
              className={i === 0 ? 'primary' : ''}
              onClick={() => confirmAnswer(c.id)}
              data-testid={`confirm-${c.id}`}
            >
              {c.label}
            </button>
          ))}
          <button type="button" onClick={() => confirmAnswer(null)} data-testid="confirm-cancel">
            Cancel
          </button>
        </div>
      </div>
    </div>
  );
}
