// Switching a cabinet's type or port shape: a new box document of the chosen kind that keeps what
// carries over (volume, losses, port count). Starting values are placeholders the user then edits;
// an alignment suggestion of that kind is preferred when the engine offers one.
import type { BoxDoc, PortDoc } from '../engine/design/document.ts';
import { BOX_KINDS, BOX_TYPES } from '../engine/box/index.ts';
import type { Suggestion } from './engine.ts';

export type BoxType = BoxDoc['type'];

/** Every box kind the engine knows, with its own display name, in registry order. */
export const BOX_CHOICES: { value: BoxType; label: string }[] = BOX_TYPES.map((t) => ({ value: t, label: BOX_KINDS[t].label }));

/** A box kind's name; a kind the registry does not know shows its type. */
export const boxLabel = (type: string): string => (BOX_KINDS as Record<string, { label: string } | undefined>)[type]?.label ?? type;

/** Net volume of all a box's chambers, litres, as typed. */
export function netVolumeL(box: BoxDoc): number {
  return box.type === 'bandpass4' ? box.vb_rear_l + box.vb_front_l : box.vb_l;
}

export function boxOfType(current: BoxDoc, type: BoxType, suggestions: Suggestion[], driverSdCm2: number, driverXmaxMm: number): BoxDoc {
  if (current.type === type) return current;
  const offered = suggestions.find((s) => s.box.type === type);
  if (offered) return structuredClone(offered.box);
  const ql = current.ql;
  const vb = netVolumeL(current);
  const ports = 'ports' in current ? current.ports : [{ diameter_cm: 5, count: 1 }];
  switch (type) {
    case 'sealed':
      return { type: 'sealed', vb_l: vb, ...(ql !== undefined ? { ql } : {}) };
    case 'vented':
      return { type: 'vented', vb_l: vb, fb_hz: 40, ports };
    case 'passive-radiator':
      return {
        type: 'passive-radiator',
        vb_l: vb,
        radiator: { sd_cm2: driverSdCm2, mmp_g: 60, cmp_mm_per_n: 0.5, xmax_mm: Math.max(1, 2 * driverXmaxMm), count: 1 },
      };
    case 'bandpass4':
      // Placeholders: the volume split evenly between the chambers, the front tuned an octave up.
      return { type: 'bandpass4', vb_rear_l: vb / 2, vb_front_l: vb / 2, fb_hz: 80, ports };
  }
}

export type PortShape = 'round' | 'slot';

export const portShape = (p: PortDoc | undefined): PortShape =>
  p && p.diameter_cm === undefined && (p.width_cm !== undefined || p.height_cm !== undefined) ? 'slot' : 'round';

export function portOfShape(p: PortDoc, shape: PortShape): PortDoc {
  if (portShape(p) === shape) return p;
  const { diameter_cm, width_cm, height_cm, ...rest } = p;
  if (shape === 'slot') {
    const d = diameter_cm ?? 5;
    return { ...rest, width_cm: Number((d * 2).toFixed(1)), height_cm: Number((d / 2).toFixed(1)) };
  }
  return {
    ...rest,
    diameter_cm: width_cm !== undefined && height_cm !== undefined ? Number(Math.sqrt(width_cm * height_cm).toFixed(1)) : 5,
  };
}
