import { createRandom } from "./random";

/**
 * The demo company's weekly history: three years of spend per channel, one promotion control and sales.
 *
 * Larkspur Outfitters is invented, and so is every number here. The generator is built so the demo shows
 * what planners meet in real data:
 * - Online video and display are bought together, so their weekly spends are strongly correlated.
 * - Display has no effect of its own in the generating process: alone it looks useful because it rides on
 *   video, and its apparent effect disappears once video is in the model.
 * - Spend levels vary (flighting, seasonal pushes, pauses) so a slider can reach the edge of the observed range.
 * - Sales carry noise and a mild season that the model does not see.
 */

export const demoChannels = [
  { column: "search_eur", label: "Search", unit: "EUR" },
  { column: "social_eur", label: "Social", unit: "EUR" },
  { column: "video_eur", label: "Online video", unit: "EUR" },
  { column: "display_eur", label: "Display", unit: "EUR" },
  { column: "podcast_eur", label: "Podcast", unit: "EUR" },
  { column: "email_eur", label: "E-mail", unit: "EUR" },
] as const;

export const demoControl = { column: "promo_week", label: "Promotion week", unit: "weeks" } as const;
export const demoOutcome = { column: "sales_eur", label: "Weekly sales", unit: "EUR" } as const;
export const demoPeriod = { column: "week_start", label: "Week starting" } as const;

export type DemoWeek = {
  week_start: string;
  search_eur: number;
  social_eur: number;
  video_eur: number;
  display_eur: number;
  podcast_eur: number;
  email_eur: number;
  promo_week: number;
  sales_eur: number;
};

/** Per-euro weekly sales response of the generating process (what a perfect fit would recover). */
export const generatingCoefficients = {
  intercept: 182_000,
  search_eur: 2.3,
  social_eur: 1.5,
  video_eur: 1.8,
  display_eur: 0,
  podcast_eur: 2.6,
  email_eur: 1.1,
  promo_week: 21_000,
} as const;

const weeks = 156;
const firstMonday = Date.UTC(2023, 0, 2);

function roundTo(value: number, step: number): number {
  return Math.round(value / step) * step;
}

export function generateDemoHistory(seed = 20_231_101): DemoWeek[] {
  const random = createRandom(seed);
  const rows: DemoWeek[] = [];
  let videoFlight = 1;
  for (let week = 0; week < weeks; week += 1) {
    const date = new Date(firstMonday + week * 7 * 86_400_000).toISOString().slice(0, 10);
    const season = Math.sin((2 * Math.PI * (week + 8)) / 52); // spring and autumn outdoor seasons
    const yearTrend = 1 + 0.06 * Math.floor(week / 52);

    // Video runs in flights of a few weeks on, then a lighter maintenance level.
    if (week % 6 === 0) videoFlight = random.uniform() < 0.55 ? 1.45 : 0.6;
    const search = Math.max(4_000, random.normal(17_000 + 5_500 * season, 3_200) * yearTrend);
    const social = Math.max(2_500, random.normal(9_500 + 2_000 * season, 2_600));
    const video = Math.max(1_500, random.normal(11_000 * videoFlight, 1_900));
    // Display is booked alongside video: a share of the video budget plus a little of its own.
    const display = Math.max(800, 0.55 * video + random.normal(1_200, 650));
    const podcast = random.uniform() < 0.3 ? random.uniform() * 900 : Math.max(1_000, random.normal(5_200, 1_700));
    const email = Math.max(600, random.normal(2_400, 700));
    const promo = random.uniform() < 0.17 ? 1 : 0;

    const c = generatingCoefficients;
    const sales =
      c.intercept +
      c.search_eur * search +
      c.social_eur * social +
      c.video_eur * video +
      c.display_eur * display +
      c.podcast_eur * podcast +
      c.email_eur * email +
      c.promo_week * promo +
      9_000 * season +
      random.normal(0, 11_000);

    rows.push({
      week_start: date,
      search_eur: roundTo(search, 10),
      social_eur: roundTo(social, 10),
      video_eur: roundTo(video, 10),
      display_eur: roundTo(display, 10),
      podcast_eur: roundTo(podcast, 10),
      email_eur: roundTo(email, 10),
      promo_week: promo,
      sales_eur: roundTo(sales, 1),
    });
  }
  return rows;
}

/** The history as the CSV an analyst would upload (comma separated, header row, ISO dates). */
export function demoHistoryCsv(rows: DemoWeek[] = generateDemoHistory()): string {
  const columns = [demoPeriod.column, ...demoChannels.map((c) => c.column), demoControl.column, demoOutcome.column] as const;
  const lines = [columns.join(",")];
  for (const row of rows) lines.push(columns.map((column) => String(row[column])).join(","));
  return `${lines.join("\n")}\n`;
}
