/** The messages of one area of an image, shown beside what they concern. */
import type { Doc, MessageArea } from '../state/document.js';

export function Messages({ doc, area }: { doc: Doc; area: MessageArea }) {
  const list = doc.messages.filter((m) => m.area === area);
  if (list.length === 0) return null;
  return (
    <ul className="messages" data-testid={`messages-${area}`}>
      {list.map((m, i) => (
        <li key={i} className={m.level} role={m.level === 'error' ? 'alert' : undefined}>
          {m.text}
        </li>
      ))}
    </ul>
  );
}
