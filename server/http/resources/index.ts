/** Every store resource under one sub-application, with bearer sign-in. */
import type { Runner } from '../../jobs/tasks.ts';
import type { Store } from '../../store/index.ts';
import { identify } from '../auth.ts';
import { allocationRoutes } from './allocations.ts';
import { campaignRoutes } from './campaigns.ts';
import { resourceApp } from './common.ts';
import { exchangeRoutes } from './exchange.ts';
import { measurementRoutes } from './measurements.ts';
import { nightReportRoutes } from './night-reports.ts';
import { nightVisibilityRoutes } from './night-visibility.ts';
import { blockRoutes, nightRoutes } from './nights.ts';
import { orbitSolutionRoutes } from './orbit-solutions.ts';
import { nightScheduleRoutes } from './night-schedule.ts';
import { planRoutes } from './plan.ts';
import { seasonPlanRoutes } from './season-plan.ts';
import { replanRoutes } from './replan.ts';
import { timeRequestRoutes } from './time-request.ts';
import { siteRoutes } from './sites.ts';
import { siteStatisticsRoutes } from './site-statistics.ts';
import { systemRoutes, targetRoutes } from './systems.ts';
import { targetViewRoutes } from './target-views.ts';
import { userRoutes } from './users.ts';

export function storeRoutes(store: Store, run: Runner) {
  const app = resourceApp();
  app.use('*', identify(store, { queryTokenPaths: /\/calendar\.ics$/ }));
  app.openAPIRegistry.registerComponent('securitySchemes', 'bearer', {
    type: 'http',
    scheme: 'bearer',
    description: 'a token from `epochwright account add` or POST /api/users',
  });
  for (const routes of [
    systemRoutes,
    targetRoutes,
    orbitSolutionRoutes,
    siteRoutes,
    siteStatisticsRoutes,
    campaignRoutes,
    allocationRoutes,
    nightRoutes,
    blockRoutes,
    nightReportRoutes,
    measurementRoutes,
    userRoutes,
  ]) {
    app.route('/', routes(store));
  }
  // Routes whose computations run where `run` says (the server's worker pool).
  for (const routes of [
    exchangeRoutes,
    seasonPlanRoutes,
    nightScheduleRoutes,
    replanRoutes,
    timeRequestRoutes,
    planRoutes,
    nightVisibilityRoutes,
    targetViewRoutes,
  ])
    app.route('/', routes(store, run));
  return app;
}
