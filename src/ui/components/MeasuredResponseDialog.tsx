// "Import measured response": the user picks a frequency-response table and a blend frequency;
// the way then plays the measurement above it (one undoable step).
import { useState } from 'preact/hooks';
import { useApp } from '../context.ts';
import { Dialog } from './Dialog.tsx';
import { designWithMeasured, MAX_RESPONSE_FILE_BYTES, measuredField } from '../measured-response.ts';
import { SLOT_LABEL, type Slot } from '../store.ts';

interface Picked {
  name: string;
  text: string;
}

export function MeasuredResponseDialog(p: { slot: Slot; wayIndex: number; onClose: () => void }) {
  const { state, dispatch } = useApp();
  const way = state.designs[p.slot].ways[p.wayIndex];
  const current = way?.kind === 'driver' ? way.measured_response : undefined;
  const [picked, setPicked] = useState<Picked | null>(null);
  const [blend, setBlend] = useState(String(current?.blend_hz ?? 500));
  const [problem, setProblem] = useState<string | null>(null);

  const pick = async (e: Event) => {
    const file = (e.currentTarget as HTMLInputElement).files?.[0];
    setPicked(null);
    if (!file) return setProblem('no file chosen');
    if (file.size > MAX_RESPONSE_FILE_BYTES) return setProblem(`${file.name} is larger than 8 MiB, too large for a response table`);
    setProblem(null);
    setPicked({ name: file.name, text: await file.text() });
  };
  const attach = () => {
    if (!picked) return setProblem('choose the measured response first');
    const r = measuredField(picked.text, picked.name, Number(blend.replace(',', '.')));
    if (!r.ok) return setProblem(r.message);
    const design = designWithMeasured(state.designs[p.slot], p.wayIndex, r.field);
    dispatch({ type: 'replace', slot: p.slot, design, reason: `use a measured response on ${SLOT_LABEL[p.slot]} ${way?.name ?? ''}` });
    p.onClose();
  };
  const remove = () => {
    const design = designWithMeasured(state.designs[p.slot], p.wayIndex, null);
    dispatch({ type: 'replace', slot: p.slot, design, reason: `remove the measured response of ${SLOT_LABEL[p.slot]} ${way?.name ?? ''}` });
    p.onClose();
  };
  return (
    <Dialog
      id="measured-response"
      title={`Measured response for ${SLOT_LABEL[p.slot]} ${way?.name ?? ''}`}
      onClose={p.onClose}
      actions={
        <>
          <button type="button" onClick={attach} disabled={!picked}>
            Use it above the blend
          </button>
          {current ? (
            <button type="button" onClick={remove}>
              Remove the measured response
            </button>
          ) : null}
          <button type="button" onClick={p.onClose}>
            Close
          </button>
        </>
      }
    >
      <p class="group-note">
        A table of frequency (Hz), SPL (dB) and optionally phase (°) of this driver in its cabinet. Columns in any order, header and comment
        lines allowed. Above the blend frequency the way plays the measurement, below it the model; over the octave around it the two are
        crossfaded. The measured level is matched to the model there, so any dB reference will do. Without a phase column the minimum phase
        is used. The table must start half an octave below the blend and reach an octave and a half above it.
      </p>
      {current ? (
        <p class="group-note">
          Now: {current.source ?? 'a table'} ({current.freq_hz.length} points) above {current.blend_hz} Hz.
        </p>
      ) : null}
      <label class="stack">
        Measured response
        <input type="file" accept=".txt,.csv,.dat,.frd,text/plain,text/csv" onChange={pick} />
      </label>
      <label class="stack">
        Blend frequency (Hz)
        <input type="text" inputMode="decimal" value={blend} onInput={(e) => setBlend(e.currentTarget.value)} />
      </label>
      {problem ? (
        <p class="dialog-problem" role="alert">
          {problem}
        </p>
      ) : null}
    </Dialog>
  );
}
