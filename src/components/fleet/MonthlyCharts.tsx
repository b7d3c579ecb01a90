// Two bar charts for the pool overview: trips out and back per month, and periodic tests falling due per
// month. Drawn in the browser (recharts); the same numbers are in tables on the page for screen readers and
// for anyone who prefers to read them, so the charts themselves are hidden from assistive technology.
import type { ReactElement } from 'react';
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import tailwindConfig from '../../../tailwind.config.mjs';

interface TripMonth {
  month: string;
  label: string;
  dispatched: number;
  returned: number;
}
interface TestMonth {
  month: string;
  label: string;
  intermediate: number;
  full: number;
}

type Shades = Record<string, string>;
// The palette's tokens, read from the Tailwind theme so the charts use the same colours as everything else.
const palette = (tailwindConfig as { theme: { extend: { colors: Record<string, Shades | string> } } }).theme.extend.colors;
const tone = (name: string, shade = 'DEFAULT') => {
  const entry = palette[name];
  return typeof entry === 'string' ? entry : (entry?.[shade] ?? 'currentColor');
};

const AXIS = { fontSize: 12, fill: tone('ink', 'soft') };
// Legend words in ink (ochre text would fail contrast), in the order the bars are drawn.
const LEGEND = {
  wrapperStyle: { fontSize: 13 },
  itemSorter: null,
  formatter: (value: string) => <span style={{ color: tone('ink') }}>{value}</span>,
};
const shortMonth = (label: string) => label.replace(/^(\w{3}) \d{2}(\d{2})$/, "$1 '$2");

function Frame({ children }: { children: ReactElement }) {
  return (
    // The chart is a picture of the table beside it (which screen readers read): hidden and out of the tab order.
    <div aria-hidden="true" inert className="h-64 w-full">
      <ResponsiveContainer width="100%" height="100%">
        {children}
      </ResponsiveContainer>
    </div>
  );
}

export default function MonthlyCharts({ trips, tests }: { trips: TripMonth[]; tests: TestMonth[] }) {
  return (
    <div className="grid gap-6 lg:grid-cols-2">
      <div data-testid="chart-trips">
        <h3 className="font-medium">Trips per month</h3>
        <Frame>
          <BarChart data={trips} margin={{ top: 12, right: 8, bottom: 0, left: -16 }}>
            <CartesianGrid vertical={false} stroke={tone('paper', 'line')} />
            <XAxis dataKey="label" tickFormatter={shortMonth} tick={AXIS} interval="preserveStartEnd" minTickGap={8} />
            <YAxis allowDecimals={false} tick={AXIS} />
            <Tooltip />
            <Legend {...LEGEND} />
            <Bar dataKey="dispatched" name="Dispatched" fill={tone('kelp')} isAnimationActive={false} />
            <Bar dataKey="returned" name="Back at a depot" fill={tone('harbour')} isAnimationActive={false} />
          </BarChart>
        </Frame>
      </div>
      <div data-testid="chart-tests">
        <h3 className="font-medium">Periodic tests due per month</h3>
        <Frame>
          <BarChart data={tests} margin={{ top: 12, right: 8, bottom: 0, left: -16 }}>
            <CartesianGrid vertical={false} stroke={tone('paper', 'line')} />
            <XAxis dataKey="label" tickFormatter={shortMonth} tick={AXIS} interval="preserveStartEnd" minTickGap={8} />
            <YAxis allowDecimals={false} tick={AXIS} />
            <Tooltip />
            <Legend {...LEGEND} />
            <Bar dataKey="intermediate" name="Periodic test" stackId="due" fill={tone('ochre')} isAnimationActive={false} />
            <Bar dataKey="full" name="Full inspection" stackId="due" fill={tone('ink', 'soft')} isAnimationActive={false} />
          </BarChart>
        </Frame>
      </div>
    </div>
  );
}
