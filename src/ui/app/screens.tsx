// The screen registry: every screen of the one page, in tab order, with how it is drawn and
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

export interface ScreenEntry {
  id: ScreenId;
  label: string;
  render: (theme: string) => VNode;
  /** Wide screens (charts, the bench, the printable sheet) leave out the side panel. */
  wide?: boolean;
}

export const SCREENS: ScreenEntry[] = [
  { id: 'driver', label: 'Driver sheet', render: () => <DriverSheet /> },
  { id: 'cabinet', label: 'Cabinet', render: () => <Cabinet /> },
  { id: 'drive', label: 'Drive & seat', render: () => <DriveSeat /> },
  { id: 'curves', label: 'Curves', render: (theme) => <Curves theme={theme} />, wide: true },
  { id: 'bench', label: 'Listening bench', render: (theme) => <ListeningBench theme={theme} />, wide: true },
  { id: 'stress', label: 'Stress strip', render: (theme) => <StressStrip theme={theme} />, wide: true },
  { id: 'trial', label: 'Blind trial', render: () => <BlindTrial /> },
  { id: 'headroom', label: 'Headroom probe', render: () => <HeadroomProbe /> },
  { id: 'sheet', label: 'Client sheet', render: () => <ClientSheet />, wide: true },
  { id: 'present', label: 'Present', render: () => <Presentation />, wide: true },
];

export const screenOf = (id: ScreenId): ScreenEntry => SCREENS.find((s) => s.id === id) ?? SCREENS[0];
