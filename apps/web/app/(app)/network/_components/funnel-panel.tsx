'use client';

import type { FairnessBand } from '@reelwright/metrics';
import { ChartFigure, FigureTable, LegendItem } from '~/components/charts/chart-figure';
import { FUNNEL_COLOURS, FunnelChart } from '~/components/charts/funnel-chart';
import type { NetworkComparisonResult, RateFigures, ShopFigures } from '~/server/queries/network';
import { BAND_COLOURS, BandBadge } from './band-badge';
import { formatCount, formatInterval, formatPercent } from './format';

function bandSummary(rows: { name: string; f: RateFigures }[], networkRate: number, what: string) {
  const named = (band: FairnessBand) =>
    rows
      .filter((r) => r.f.band === band)
      .map(
        (r) => `${r.name} (${formatPercent(r.f.rate)}, ${r.f.side === 'below' ? 'low' : 'high'})`,
      );
  const out = named('out of line');
  const watch = named('on watch');
  const inLine = rows.filter((r) => r.f.band === 'in line').length;
  const parts: string[] = [];
  if (out.length) parts.push(`Out of line: ${out.join(', ')}.`);
  if (watch.length) parts.push(`On watch: ${watch.join(', ')}.`);
  parts.push(
    `${inLine === rows.length ? 'All' : inLine} ${inLine === 1 ? 'shop is' : 'shops are'} in line with the network's ${what} of ${formatPercent(networkRate)} for their volume.`,
  );
  return parts.join(' ');
}

function Legend(props: { ratio?: boolean }) {
  return (
    <div className="flex flex-wrap gap-x-4 gap-y-1">
      <LegendItem colour={BAND_COLOURS['in line']}>In line</LegendItem>
      <LegendItem colour={BAND_COLOURS['on watch']} mark="triangle">
        On watch
      </LegendItem>
      <LegendItem colour={BAND_COLOURS['out of line']} mark="diamond">
        Out of line
      </LegendItem>
      <LegendItem colour={FUNNEL_COLOURS.network} mark="line">
        {props.ratio ? 'As expected (1×)' : 'Network rate'}
      </LegendItem>
      <LegendItem colour={FUNNEL_COLOURS.limit95} mark="dash">
        95% limits
      </LegendItem>
      <LegendItem colour={FUNNEL_COLOURS.limit998} mark="line">
        99.8% limits
      </LegendItem>
    </div>
  );
}

function FunnelFigure(props: {
  id: string;
  title: string;
  what: string;
  volumeLabel: string;
  eventsLabel: string;
  networkRate: number;
  rows: { shop: ShopFigures; f: RateFigures }[];
}) {
  const judged = props.rows.filter((r) => r.f.trials > 0 && r.f.band !== null);
  return (
    <ChartFigure
      id={props.id}
      title={props.title}
      summary={bandSummary(
        judged.map((r) => ({ name: r.shop.shop.name, f: r.f })),
        props.networkRate,
        props.what,
      )}
      legend={<Legend />}
      table={
        <FigureTable
          caption={props.title}
          columns={[
            { label: 'Shop' },
            { label: props.volumeLabel, numeric: true },
            { label: props.eventsLabel, numeric: true },
            { label: 'Rate', numeric: true },
            { label: '95% limits', numeric: true },
            { label: '99.8% limits', numeric: true },
            { label: 'Band' },
          ]}
          rows={props.rows.map(({ shop, f }) => ({
            key: String(shop.shop.id),
            cells: [
              shop.shop.name,
              formatCount(f.trials),
              formatCount(f.events),
              formatPercent(f.rate),
              f.trials ? formatInterval(f.funnel95) : '—',
              f.trials ? formatInterval(f.funnel998) : '—',
              <BandBadge key="band" band={f.band} side={f.side} />,
            ],
          }))}
        />
      }
    >
      <FunnelChart
        xLabel={props.volumeLabel}
        networkRate={props.networkRate}
        points={judged.map(({ shop, f }) => ({
          id: shop.shop.id,
          label: shop.shop.name,
          trials: f.trials,
          rate: f.rate ?? 0,
          band: f.band!,
        }))}
      />
    </ChartFigure>
  );
}

const ratioText = (x: number | null) => (x === null ? '—' : `${x.toFixed(2)}×`);
const ratioLimits = (i: { lower: number; upper: number } | null) =>
  i ? `${i.lower.toFixed(2)}–${i.upper.toFixed(2)}×` : '—';

/**
 * While warranty windows are open: each shop's observed ÷ expected comebacks against the
 * comebacks expected from the network's curve over its jobs' follow-up, with Spiegelhalter's
 * Poisson funnel around 1.
 */
function RatioFunnel({ data }: { data: NetworkComparisonResult }) {
  const rows = data.shops.filter((s) => s.comebacks.ratio !== null);
  const judged = rows.filter((s) => s.comebacks.ratio!.expected > 0 && s.comebacks.band !== null);
  if (judged.length === 0) {
    return (
      <p className="text-slate-600">
        No comebacks can be expected yet for the jobs of this period (no network curve, or no job
        followed for a day), so there is nothing to compare.
      </p>
    );
  }
  const title =
    'Comebacks observed ÷ expected against comebacks expected, with the 95% and 99.8% funnel limits around 1';
  return (
    <ChartFigure
      id="funnel-comebacks"
      title={title}
      summary={bandSummary(
        judged.map((s) => ({
          name: s.shop.name,
          f: { ...s.comebacks, rate: s.comebacks.rate },
        })),
        data.network.comebacks.rate ?? 0,
        'estimated comeback rate',
      ).replace(' for their volume.', ' for the comebacks their follow-up predicts.')}
      legend={<Legend ratio />}
      table={
        <FigureTable
          caption={title}
          columns={[
            { label: 'Shop' },
            { label: 'Comebacks expected', numeric: true },
            { label: 'Comebacks observed', numeric: true },
            { label: 'Observed ÷ expected', numeric: true },
            { label: '95% limits', numeric: true },
            { label: '99.8% limits', numeric: true },
            { label: 'Band' },
          ]}
          rows={rows.map((s) => {
            const r = s.comebacks.ratio!;
            return {
              key: String(s.shop.id),
              cells: [
                s.shop.name,
                r.expected.toFixed(1),
                formatCount(r.observed),
                ratioText(r.ratio),
                ratioLimits(r.funnel95),
                ratioLimits(r.funnel998),
                <BandBadge key="band" band={s.comebacks.band} side={s.comebacks.side} />,
              ],
            };
          })}
        />
      }
    >
      <FunnelChart
        kind="ratio"
        xLabel="Comebacks expected from the network's curve"
        networkRate={1}
        points={judged.map((s) => ({
          id: s.shop.id,
          label: s.shop.name,
          trials: s.comebacks.ratio!.expected,
          rate: s.comebacks.ratio!.ratio ?? 0,
          band: s.comebacks.band!,
        }))}
      />
    </ChartFigure>
  );
}

/** Funnel plots of comeback rate and audit failure rate against volume for the shops in view. */
export function FunnelPanel({ data }: { data: NetworkComparisonResult }) {
  const comebackRate = data.network.comebacks.rate;
  const auditRate = data.network.audits.rate;
  const withComebacks = data.shops.filter((s) => s.comebacks.trials > 0);
  return (
    <div className="grid grid-cols-[minmax(0,1fr)] gap-8">
      {data.network.comebacks.comparison === 'ratio' ? (
        <RatioFunnel data={data} />
      ) : comebackRate === null || withComebacks.length === 0 ? (
        <p className="text-slate-600">
          No collected job in this period has a closed warranty window yet, so there is no comeback
          rate to compare.
        </p>
      ) : (
        <FunnelFigure
          id="funnel-comebacks"
          title="Comeback rate against volume, with the network rate and its 95% and 99.8% funnel limits"
          what="comeback rate"
          volumeLabel="Jobs counted (collected, window closed or came back)"
          eventsLabel="Comebacks counted"
          networkRate={comebackRate}
          rows={data.shops.map((s) => ({ shop: s, f: s.comebacks }))}
        />
      )}
      {auditRate === null ? (
        <section aria-labelledby="funnel-audits-title">
          <h3 id="funnel-audits-title" className="text-base font-semibold text-slate-900">
            Audit failure rate against samples scored
          </h3>
          <p className="mt-1 text-slate-600">
            No audit rounds yet: this funnel appears once auditors have scored samples in rounds
            that end in the period.
          </p>
        </section>
      ) : (
        <FunnelFigure
          id="funnel-audits"
          title="Audit failure rate against samples scored, with the network rate and its funnel limits"
          what="audit failure rate"
          volumeLabel="Audit samples scored"
          eventsLabel="Samples failed"
          networkRate={auditRate}
          rows={data.shops
            .filter((s) => s.audits.rounds > 0)
            .map((s) => ({ shop: s, f: s.audits }))}
        />
      )}
    </div>
  );
}
