import { withQuery } from '../lib/query/provider';
import { TankTable } from './fleet/TankTable';
import { OfflineBanner } from './ui/States';

/** Every cylinder, for engineers and the desk (the same table as on the fleet page). */
function TankList({ towns }: { towns: string[] }) {
  return (
    <div className="space-y-4">
      <OfflineBanner />
      <h1 className="text-2xl font-semibold tracking-tight">Cylinders</h1>
      <TankTable towns={towns} />
    </div>
  );
}

export default withQuery(TankList);
