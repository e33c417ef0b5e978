/** Save: result JSON, CSV row, overlay PNG, HTML report (only when the result is current), session files. */
import { resultStateOf } from '../../state/results.js';
import { Messages } from '../Messages.js';
import { FileButton } from '../fields.js';
import type { PanelProps } from './types.js';

export function SavePanel(p: PanelProps) {
  const current = resultStateOf(p.doc, p.series).state === 'current';
  const why = current ? undefined : 'Available when the result is current';
  return (
    <section>
      <h2>Save</h2>
      <div className="buttons">
        <button disabled={!current} title={why} onClick={() => p.flows.save('json')} data-testid="export-json">
          Result JSON
        </button>
        <button disabled={!current} title={why} onClick={() => p.flows.save('csv')} data-testid="export-csv">
          CSV row
        </button>
        <button disabled={!current} title={why} onClick={() => p.flows.save('png')} data-testid="export-png">
          Overlay PNG
        </button>
        <button disabled={!current} title={why} onClick={() => p.flows.save('html')} data-testid="export-html">
          Report (HTML)
        </button>
      </div>
      <div className="buttons">
        <button onClick={() => p.flows.save('session')} data-testid="export-session" title="The image's inputs and corrections, to take the work up again">
          Save session
        </button>
        <FileButton label="Reopen session…" accept=".json,application/json" testId="open-session" onFiles={([f]) => p.flows.openSession(f)} />
      </div>
      <Messages doc={p.doc} area="save" />
      <Messages doc={p.doc} area="session" />
    </section>
  );
}
