// The floor of each KPI question: the one SQL statement someone would write by hand to answer it from
// the imported data (raw samples, work orders, element and job registers), without Osmia's derived
// tables. Where the engine does more than plain SQL can (a maximum-likelihood fit, likelihood-ratio
// intervals, a confidence band), the floor answers with what SQL can do for the same question: the
// Kaplan–Meier curve and a median-rank-regression Weibull line for element life, that line's monthly
// expected replacements for the forecast. tests/bench/kpi-floors.test.ts checks that these
// statements agree with the engine where they overlap, so the comparison is like for like.

export interface FloorContext {
  siteId: number;
  timeZone: string;
  /** Historian step, for volumes from flow samples. */
  stepMinutes: number;
  /** settings.elementUnitCost */
  elementUnitCost: number;
}

/** The lives of the default window: installs before its end, followed to removal or to the end. */
function livesSql(c: FloorContext): string {
  return `bounds as (
      select max(greatest(installed_at, removed_at)) + interval '1 second' as stop from elements where site_id = ${c.siteId}),
    lives as (
      select extract(epoch from least(coalesce(e.removed_at, b.stop), b.stop) - e.installed_at) / 86400 as t,
             coalesce(e.removed_at < b.stop and e.removal_reason in ('failed', 'performance', 'damaged'), false) as ev
      from elements e cross join bounds b
      where e.site_id = ${c.siteId} and e.installed_at < b.stop)`;
}

/**
 * Weibull by median-rank regression (y = ln(−ln(1 − F)) on x = ln t), Bernard's median ranks with
 * Johnson's adjusted order numbers written as a product: n + 1 − j_k = (n + 1)·Π_{events ≤ k} (n − i)/(n − i + 1).
 */
function rankRegressionSql(): string {
  return `ordered as (
      select t, ev, row_number() over (order by t, ev desc) - 1 as i, count(*) over () as n from lives where t > 0),
    ranks as (
      select t, ev, n, (n + 1) * (1 - exp(sum(case when ev then ln((n - i)::float8 / (n - i + 1)) else 0 end) over (order by i))) as j
      from ordered),
    line as (
      select regr_slope(ln(-ln(1 - (j - 0.3) / (n + 0.4))), ln(t)) as shape,
             regr_intercept(ln(-ln(1 - (j - 0.3) / (n + 0.4))), ln(t)) as intercept
      from ranks where ev),
    fit as (select shape, exp(-intercept / shape) as scale from line)`;
}

/** z for a two-sided 90 % interval, the engine's default confidence (normal quantile 0.95). */
const Z90 = 1.6448536269514722;

function runningFromSamples(c: FloorContext): string {
  return `select s.tag_id, s.ts, s.value, lead(s.ts) over (partition by s.tag_id order by s.ts) as next_ts
      from samples s join tags t on t.id = s.tag_id
      where t.site_id = ${c.siteId} and t.quantity = 'run_status' and (s.quality & 192) = 192`;
}

export function kpiFloors(c: FloorContext): Record<string, string> {
  return {
    // Operating hours of the trains from their run status, failures and restoration hours from work orders.
    reliability: `with run as (${runningFromSamples(c)} and t.asset_id in (select id from assets where kind = 'train'))
                  select (select sum(extract(epoch from next_ts - ts)) / 3600 from run where value >= 0.5) as operating_hours,
                         count(*) filter (where type = 'corrective' and failure_code is not null) as failures,
                         avg(extract(epoch from out_of_service_to - out_of_service_from) / 3600) filter (where type = 'corrective' and failure_code is not null) as mttr_hours
                  from work_orders where site_id = ${c.siteId}`,
    // Kaplan–Meier survival with Greenwood's log-transformed 90 % bounds at every distinct life, and the
    // rank-regression Weibull line with its B10 and median lives.
    'element-life': `with ${livesSql(c)},
      times as (select t, count(*) filter (where ev) as d, count(*) as m from lives group by t),
      risk as (select t, d, m, sum(m) over (order by t desc) as n_risk from times),
      km as (
        select t, d, m, n_risk,
               case when bool_or(d = n_risk) over w then 0
                    else exp(sum(ln(case when d < n_risk then 1 - d::float8 / n_risk else 1 end)) over w) end as survival,
               sum(case when d > 0 and d < n_risk then d::float8 / (n_risk * (n_risk - d)) else 0 end) over w as greenwood
        from risk window w as (order by t)),
      ${rankRegressionSql()}
      select km.*, km.survival * exp(-${Z90} * sqrt(km.greenwood)) as lower, least(1, km.survival * exp(${Z90} * sqrt(km.greenwood))) as upper,
             fit.shape, fit.scale, fit.scale * power(-ln(0.9), 1 / fit.shape) as b10, fit.scale * power(ln(2), 1 / fit.shape) as median
      from km cross join fit order by km.t`,
    // The rank-regression line's expected life-ending events per calendar month for the elements in service.
    forecast: `with ${livesSql(c)},
      ${rankRegressionSql()},
      edges as (
        select b.stop, date_trunc('month', b.stop at time zone '${c.timeZone}') as month0 from bounds b),
      periods as (
        select k, greatest(e.stop, (e.month0 + k * interval '1 month') at time zone '${c.timeZone}') as p_start,
               (e.month0 + (k + 1) * interval '1 month') at time zone '${c.timeZone}' as p_end, e.stop
        from edges e cross join generate_series(0, 12) k),
      in_service as (
        select extract(epoch from b.stop - e.installed_at) / 86400 as age
        from elements e cross join bounds b
        where e.site_id = ${c.siteId} and e.installed_at < b.stop and (e.removed_at is null or e.removed_at > b.stop)),
      hazards as (
        select p.k, power(i.age / f.scale, f.shape) as h_age,
               power((i.age + extract(epoch from p.p_start - p.stop) / 86400) / f.scale, f.shape) as h_start,
               power((i.age + extract(epoch from p.p_end - p.stop) / 86400) / f.scale, f.shape) as h_end
        from in_service i cross join periods p cross join fit f)
      select k, sum(exp(h_age - h_start) * (1 - exp(h_start - h_end))) as expected,
             sum(exp(h_age - h_start) * (1 - exp(h_start - h_end))) * ${c.elementUnitCost} as cost
      from hazards group by k order by k`,
    // Each job's duration (first step start to last step end), and the durations by guided, crew and
    // procedure, by quarter and in runs of ten jobs.
    'time-to-complete': `with jobs as (
        select w.id, w.wo_number, w.crew, bool_or(s.guided) as guided, min(s.started_at) as first_start,
               case when a.kind = 'vessel' then case when w.type = 'inspection' then 'vessel inspection' else 'element replacement' end
                    else a.kind || ' ' || w.type end as procedure,
               extract(epoch from max(s.completed_at) - min(s.started_at)) / 3600 as h
        from job_steps s join work_orders w on w.id = s.work_order_id join assets a on a.id = w.asset_id
        where w.site_id = ${c.siteId} group by w.id, a.kind),
      kept as (select *, (row_number() over (order by first_start, id) - 1) / 10 as run from jobs where h > 0)
      select 'group' as kind, guided::text, crew, procedure, null as period, count(*), avg(h), percentile_cont(array[0.5, 0.9]) within group (order by h),
             stddev_samp(h), min(h), max(h)
      from kept group by grouping sets ((), (guided), (crew), (procedure))
      union all
      select 'quarter', null, null, null, to_char(date_trunc('quarter', first_start at time zone '${c.timeZone}'), 'YYYY-"Q"Q'), count(*), avg(h),
             array[percentile_cont(0.5) within group (order by h)], null, null, null
      from kept group by 5
      union all
      select 'run', null, null, null, run::text, count(*), avg(h), array[percentile_cont(0.5) within group (order by h)], null, null, null
      from kept group by run
      union all
      select 'job', guided::text, crew, procedure, wo_number, 1, h, null, null, extract(epoch from first_start), null
      from kept`,
    // Stopped hours and stop count per run-status tag from the raw samples.
    downtime: `with run as (${runningFromSamples(c)}), edges as (select *, lag(value) over (partition by tag_id order by ts) as prev from run)
               select tag_id, sum(extract(epoch from next_ts - ts)) filter (where value < 0.5) / 3600 as stopped_hours,
                      count(*) filter (where value < 0.5 and prev >= 0.5) as stops
               from edges group by tag_id`,
    // Daily means of every process tag from the raw samples.
    performance: `select t.asset_id, t.quantity, date_trunc('day', s.ts), avg(s.value) from samples s join tags t on t.id = s.tag_id
                  where t.site_id = ${c.siteId} and t.quantity <> 'run_status' and (s.quality & 192) = 192 group by 1, 2, 3`,
    // Hours and cost by work-order type, open backlog, and the permeate produced (from raw flow samples).
    'maintenance-mix': `select type, sum(labour_hours), sum(labour_cost + parts_cost), count(*) filter (where status in ('open', 'in_progress')),
                          (select sum(s.value) * ${c.stepMinutes} / 60.0 from samples s join tags t on t.id = s.tag_id
                           where t.site_id = ${c.siteId} and t.quantity = 'permeate_flow' and (s.quality & 192) = 192)
                        from work_orders where site_id = ${c.siteId} group by type`,
  };
}
