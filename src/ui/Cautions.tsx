// The cautions every user sees on first use; dismissible, reopened from the header.
import { Dialog } from './components/Dialog.tsx';

export const CAUTIONS: { title: string; text: string }[] = [
  {
    title: 'Protect your hearing',
    text: 'Planned levels can be loud enough to damage hearing, on speakers and on headphones. Listening starts at a moderate monitor level; raise it slowly, take breaks, and keep real playback below what your ears tolerate comfortably.',
  },
  {
    title: 'The models are estimates',
    text: 'Every curve and every overload warning comes from a model of the driver and box. Real drivers vary from their data sheets and can fail earlier than modelled. Treat rated power, Xmax and port speed as limits, not targets.',
  },
  {
    title: 'Amplifiers and mains are electrical hazards',
    text: 'Amplifier outputs and mains wiring can deliver dangerous currents; large cabinets are heavy. Defer to local codes and licensed practice for wiring, installation and rigging. A passive crossover at high power gets hot: its resistors and inductors must be rated for the power they take.',
  },
];

export function CautionsPanel(p: { onClose: () => void; firstRun: boolean }) {
  return (
    <Dialog
      id="cautions"
      title="Before you start"
      onClose={p.onClose}
      actions={
        <button type="button" class="primary" data-autofocus onClick={p.onClose}>
          {p.firstRun ? 'I understand' : 'Close'}
        </button>
      }
    >
      <ul class="cautions">
        {CAUTIONS.map((c) => (
          <li>
            <strong>{c.title}.</strong> {c.text}
          </li>
        ))}
      </ul>
      <p class="fine">
        preheard runs entirely on this machine: nothing you enter or play is sent anywhere. You can reopen these cautions from the header at
        any time.
      </p>
    </Dialog>
  );
}
