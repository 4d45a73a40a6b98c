// The hearing caution: before the first playback of a visit, and before the monitor goes loud.
import { Dialog } from '../components/Dialog.tsx';

export function HearingDialog(p: { kind: 'first' | 'loud'; requestedDb: number; onYes: () => void; onNo: () => void }) {
  const first = p.kind === 'first';
  return (
    <Dialog
      id="hearing"
      title={first ? 'Mind your hearing' : 'Louder than the caution level?'}
      onClose={p.onNo}
      actions={
        <>
          <button type="button" class="primary" onClick={p.onYes} data-autofocus>
            {first ? 'Play at a low monitor level' : `Yes, go to ${p.requestedDb.toFixed(0)} dB`}
          </button>
          <button type="button" onClick={p.onNo}>
            {first ? 'Not now' : 'Stay at the caution level'}
          </button>
        </>
      }
    >
      {first ? (
        <>
          <p>
            The bench plays modelled overload on purpose: distortion, port noise and clipping can be sudden and loud. Sound at high levels
            damages hearing, and the damage is permanent.
          </p>
          <p>
            Turn your headphones or speakers down before you start. The monitor gain starts low; raise it slowly. The planned level of each
            design decides its physics, not how loud you listen.
          </p>
        </>
      ) : (
        <p>
          Above −12 dB the monitor can get loud on ordinary headphones or speakers. Sudden overload in the track will be as loud as the
          music around it or louder. Lower your system's volume first if you go on.
        </p>
      )}
    </Dialog>
  );
}
