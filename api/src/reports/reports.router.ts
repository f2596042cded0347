/**
 * Routes under /api/reports, open to visitors (public sets) like the leaderboards:
 *   GET /choices                                         sets and robot profiles with results, and the policies
 *   GET /model-comparison?set=&profile=&policy=&format=  the report as JSON, Markdown or LaTeX
 * A bad or unknown query parameter is 400 VALIDATION_FAILED naming it.
 */
import { Router } from 'express';
import { REPORT_FORMATS, REPORT_POLICIES, type ReportFormat } from '@shared/reports';
import type { SweepPolicy } from '@shared/sweeps';
import { AppError } from '../errors/app-error';
import type { ProvenanceReader } from '../exports/export-provenance';
import { flatQuery } from '../leaderboards/view-request';
import { reportToLatex, reportToMarkdown } from './report-export';
import type { ReportRequest, ReportsService } from './reports.service';

/** Default policy: the one that keeps the plan's order of visits (the realistic choice for most fleets; a product decision). */
export const DEFAULT_REPORT_POLICY: SweepPolicy = 'dependency-gated';

const KNOWN = ['set', 'profile', 'policy', 'format'];

const bad = (param: string, message: string): AppError => new AppError('VALIDATION_FAILED', 400, message, [{ param }]);

/** The report request and format of a query string, or 400 naming the parameter. */
export function reportQueryOf(query: unknown): ReportRequest & { readonly format: ReportFormat } {
  const params = flatQuery(query);
  const unknown = Object.keys(params).find((k) => !KNOWN.includes(k));
  if (unknown !== undefined) throw bad(unknown, `Unknown query parameter "${unknown}"; expected ${KNOWN.join(', ')}`);
  const set = params['set'];
  if (set === undefined) throw bad('set', 'Query parameter "set" (an instance set id) is required');
  if (!/^[1-9]\d{0,8}$/.test(set)) throw bad('set', `Query parameter "set" must be an instance set id (a whole number), got "${set}"`);
  const profile = params['profile'];
  if (profile !== undefined && !/^[0-9a-f]{16}$/.test(profile)) {
    throw bad('profile', `Query parameter "profile" must be a robot profile hash (16 hex digits), got "${profile}"`);
  }
  const policy = params['policy'] ?? DEFAULT_REPORT_POLICY;
  if (!(REPORT_POLICIES as readonly string[]).includes(policy)) throw bad('policy', `Query parameter "policy" must be one of ${REPORT_POLICIES.join(', ')}, got "${policy}"`);
  const format = params['format'] ?? 'json';
  if (!(REPORT_FORMATS as readonly string[]).includes(format)) throw bad('format', `Query parameter "format" must be one of ${REPORT_FORMATS.join(', ')}, got "${format}"`);
  return { setId: Number(set), ...(profile !== undefined ? { profileHash: profile } : {}), policy: policy as SweepPolicy, format: format as ReportFormat };
}

/** File name of an export: letters, digits and dashes only. */
const fileName = (setName: string, policy: string, ext: string): string =>
  `model-comparison-${`${setName}-${policy}`.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 80)}.${ext}`;

/** Report routes over the service; Markdown and LaTeX files carry the provenance of the report's results. */
export function reportsRouter(svc: ReportsService, provenanceOf: ProvenanceReader): Router {
  const r = Router();
  r.get('/choices', async (req, res) => {
    res.json(await svc.choices(req.user ?? null));
  });
  r.get('/model-comparison', async (req, res) => {
    const { format, ...request } = reportQueryOf(req.query);
    if (format === 'json') {
      // The page's own read: no provenance look-up.
      res.json(await svc.modelComparison(req.user ?? null, request));
      return;
    }
    const { report, resultIds } = await svc.modelComparisonWithResults(req.user ?? null, request);
    const provenance = await provenanceOf({ resultIds, entries: [] });
    const [text, type, ext] = format === 'markdown'
      ? [reportToMarkdown(report, provenance), 'text/markdown', 'md']
      : [reportToLatex(report, provenance), 'application/x-latex', 'tex'];
    res.type(`${type}; charset=utf-8`).attachment(fileName(report.set.name, report.policy, ext)).send(text);
  });
  return r;
}
