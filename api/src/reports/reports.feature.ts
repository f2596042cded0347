/** Wires the report routes onto one app context (one line in api-router.ts). */
import type { Router } from 'express';
import type { AppContext } from '../app-context';
import { createProvenanceReader } from '../exports/export-provenance';
import { reportsRouter } from './reports.router';
import { createReportsService } from './reports.service';

/** /api/reports. */
export function reportsFeature(ctx: AppContext): Router {
  return reportsRouter(createReportsService({ sequelize: ctx.sequelize, models: ctx.models }), createProvenanceReader(ctx.sequelize));
}
