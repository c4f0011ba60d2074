import type { Actor } from '~/lib/server/identity';
import { getStatistics } from './get';
import { StatisticsExportQuery } from '~/contracts/statistics';
import { statisticsCsvFileName, statisticsTableCsv } from './to-csv';

/** One table of the statistics report as a CSV file. */
export async function exportStatisticsCsv({ actor, input }: { actor: Actor | null; input: Record<string, string> }) {
  const { table } = StatisticsExportQuery.parse(input);
  const report = await getStatistics({ actor, input });
  return { fileName: statisticsCsvFileName(report, table), body: statisticsTableCsv(report, table) };
}
