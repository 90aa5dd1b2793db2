import { useQuery } from '@tanstack/react-query';
import { withQuery } from '../lib/query/provider';
import { fleetSummaryQuery } from '../lib/query/tanks.queries';
import { AttentionQueue } from './fleet/AttentionQueue';
import { FleetStrip } from './fleet/FleetStrip';
import { TankTable } from './fleet/TankTable';
import { ErrorNotice, Freshness, Loading, OfflineBanner } from './ui/States';
import { useNow } from './ui/useOnline';

/** The service desk's page: what needs a person first, fleet figures, then every tank. */
function FleetTriage({ towns }: { towns: string[] }) {
  const now = useNow();
  const summary = useQuery(fleetSummaryQuery());
  return (
    <div className="space-y-5">
      <OfflineBanner updatedAt={summary.dataUpdatedAt || undefined} />
      <div className="flex flex-wrap items-baseline gap-3">
        <h1 className="mr-auto text-2xl font-semibold tracking-tight">Fleet</h1>
        {summary.data && <Freshness updatedAt={summary.dataUpdatedAt} fetching={summary.isFetching} />}
      </div>
      {summary.isPending ? (
        <Loading label="Working out which cylinders need attention…" />
      ) : summary.isError && !summary.data ? (
        <ErrorNotice what="the fleet summary" error={summary.error} onRetry={() => summary.refetch()} />
      ) : summary.data ? (
        <>
          <FleetStrip s={summary.data} />
          <AttentionQueue s={summary.data} now={now} />
        </>
      ) : null}
      <TankTable towns={towns} />
    </div>
  );
}

export default withQuery(FleetTriage);
