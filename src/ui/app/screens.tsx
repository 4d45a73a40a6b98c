// The screen registry: every screen of the one page, in tab order, with its group, how it is drawn and
// whether the side panel of key figures sits beside it.
import type { VNode } from 'preact';
import type { ScreenId } from '../store.ts';
import { Cabinet } from '../screens/Cabinet.tsx';
import { Curves } from '../screens/Curves.tsx';
import { DriveSeat } from '../screens/DriveSeat.tsx';
import { DriverSheet } from '../screens/DriverSheet.tsx';
import { BlindTrial } from '../screens/BlindTrial.tsx';
import { HeadroomProbe } from '../screens/HeadroomProbe.tsx';
import { ClientSheet } from '../screens/ClientSheet.tsx';
import { Presentation } from '../screens/Presentation.tsx';
import { ListeningBench } from '../screens/ListeningBench.tsx';
import { StressStrip } from '../screens/StressStrip.tsx';

/** Our own grouping of the screens by the part of the work they serve (the navigation's three groups). */
export type ScreenGroup = 'Design' | 'Listen' | 'Decide';
export const SCREEN_GROUPS: readonly ScreenGroup[] = ['Design', 'Listen', 'Decide'];

export interface ScreenEntry {
  id: ScreenId;
  label: string;
  /** The label where the navigation is narrow: a word of the full label, so the accessible name still contains it. */
  short: string;
  group: ScreenGroup;
  render: (theme: string) => VNode;
  /** Wide screens (charts, the bench, the printable sheet) leave out the side panel. */
  wide?: boolean;
}

export const SCREENS: ScreenEntry[] = [
  { id: 'driver', label: 'Driver sheet', short: 'Driver', group: 'Design', render: () => <DriverSheet /> },
  { id: 'cabinet', label: 'Cabinet', short: 'Cabinet', group: 'Design', render: () => <Cabinet /> },
  { id: 'drive', label: 'Drive & seat', short: 'Drive & seat', group: 'Design', render: () => <DriveSeat /> },
  { id: 'curves', label: 'Curves', short: 'Curves', group: 'Design', render: (theme) => <Curves theme={theme} />, wide: true },
  {
    id: 'bench',
    label: 'Listening bench',
    short: 'Bench',
    group: 'Listen',
    render: (theme) => <ListeningBench theme={theme} />,
    wide: true,
  },
  { id: 'stress', label: 'Stress strip', short: 'Stress', group: 'Listen', render: (theme) => <StressStrip theme={theme} />, wide: true },
  { id: 'trial', label: 'Blind trial', short: 'Trial', group: 'Listen', render: () => <BlindTrial /> },
  { id: 'headroom', label: 'Headroom probe', short: 'Headroom', group: 'Decide', render: () => <HeadroomProbe /> },
  { id: 'sheet', label: 'Client sheet', short: 'Sheet', group: 'Decide', render: () => <ClientSheet />, wide: true },
  { id: 'present', label: 'Present', short: 'Present', group: 'Decide', render: () => <Presentation />, wide: true },
];

export const screenOf = (id: ScreenId): ScreenEntry => SCREENS.find((s) => s.id === id) ?? SCREENS[0];
