/** The list of keyboard shortcuts (from the command table). */
import { COMMANDS } from '../state/commands.js';

export function HelpDialog({ onClose }: { onClose(): void }) {
  return (
    <div className="help" role="dialog" aria-label="Keyboard shortcuts" onClick={onClose}>
      <div className="help-box" onClick={(e) => e.stopPropagation()}>
        <h2>Keyboard shortcuts</h2>
        <table>
          <tbody>
            {COMMANDS.map((c) => (
              <tr key={c.name}>
                <th>
                  <kbd>{c.key}</kbd>
                </th>
                <td>{c.label}</td>
              </tr>
            ))}
            <tr>
              <th>
                <kbd>wheel</kbd>
              </th>
              <td>Zoom about the cursor</td>
            </tr>
            <tr>
              <th>
                <kbd>drag</kbd>
              </th>
              <td>Pan (Pan tool anywhere; other tools away from what they edit)</td>
            </tr>
          </tbody>
        </table>
        <p className="hint">Letter shortcuts also work while a number field has the focus (they leave the field); Esc leaves any field.</p>
        <button onClick={onClose}>Close</button>
      </div>
    </div>
  );
}
