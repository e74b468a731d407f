// The bar chart of lapses per week (recharts), loaded on its own so the Overview paints without it.
import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';

export default function LapsesBars({ weeks }: { weeks: { weekStart: string; count: number }[] }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <BarChart data={weeks} margin={{ top: 8, right: 8, bottom: 8, left: -16 }}>
        <CartesianGrid strokeDasharray="3 3" vertical={false} />
        <XAxis dataKey="weekStart" tickFormatter={(d: string) => d.slice(5)} fontSize={12} />
        <YAxis allowDecimals={false} fontSize={12} />
        <Tooltip formatter={(v) => [v, 'lapses']} labelFormatter={(d) => `Week of ${typeof d === "string" ? d : ""}`} />
        <Bar dataKey="count" name="Lapses" fill="#b45309" radius={[3, 3, 0, 0]} />
      </BarChart>
    </ResponsiveContainer>
  );
}
