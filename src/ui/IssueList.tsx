// Every problem of both designs, with the field it belongs to.
import { useApp } from './context.ts';
import { plural } from './format.ts';
import { SLOTS, SLOT_LABEL } from './store.ts';

export function IssueList() {
  const { derived } = useApp();
  const any = SLOTS.some((s) => derived[s].issues.length > 0);
  if (!any) return <p class="checks-ok">No problems in either design.</p>;
  return (
    <div class="checks">
      {SLOTS.map((s) =>
        derived[s].issues.length ? (
          <div>
            <h4>
              <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span>{' '}
              {plural(derived[s].issues.filter((i) => i.severity === 'error').length, 'error')},{' '}
              {plural(derived[s].issues.filter((i) => i.severity === 'warning').length, 'warning')}
            </h4>
            <ul class="problems">
              {derived[s].issues.map((i) => (
                <li class={i.severity}>
                  <code>{i.path || 'design'}</code> {i.message}
                </li>
              ))}
            </ul>
          </div>
        ) : null,
      )}
    </div>
  );
}
