// The side panel beside the narrow screens: key figures, SPL and excursion, the checks.
import { FigureTable } from '../FigureTable.tsx';
import { IssueList } from '../IssueList.tsx';
import { SubsonicOffers } from '../components/SubsonicOffer.tsx';
import { ChartCard, useCharts } from '../screens/Curves.tsx';

const GLANCE_CHARTS = ['spl', 'excursion'] as const;

export function Glance({ theme }: { theme: string }) {
  const charts = useCharts(GLANCE_CHARTS);
  const spl = charts.find((c) => c.id === 'spl')!;
  const ex = charts.find((c) => c.id === 'excursion')!;
  return (
    <aside class="glance" aria-label="At a glance">
      <FigureTable compact />
      <ChartCard spec={spl} height={190} theme={theme} />
      <ChartCard spec={ex} height={170} theme={theme} />
      <section class="glance-checks" aria-label="Checks">
        <h3>Checks</h3>
        <IssueList />
        <SubsonicOffers />
      </section>
    </aside>
  );
}
