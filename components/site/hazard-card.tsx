import type { Hazard } from '@/components/data/visits';
import { CautionHeading } from '@/components/ui/caution';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { mToFt } from '@/telemetry/math/units';

/** The server's one falling-ice hazard for a site: the same words and radius as the check-in and the wall. */
export function HazardCard({ hazard: hz }: { hazard: Hazard & { radiusM: number } }) {
  return (
    <Card>
      <CautionHeading title="Falling ice: keep clear" />
      <Text>
        {hz.reason}. Screening radius around the tower:{' '}
        <Text strong>
          {hz.radiusM.toFixed(0)} m ({mToFt(hz.radiusM).toFixed(0)} ft)
        </Text>
        , for ice from {hz.towerHeightM} m in a {hz.windMs} m/s wind.
      </Text>
      <Text>
        Falling ice can kill. Wear a hard hat, agree a plan for where to stand and where to take cover under something
        sturdy before anyone goes near; a vehicle roof is not enough.
      </Text>
      <Text variant="small" muted>
        No published tower-specific formula exists: this is a screening figure ({hz.assumptions.slice(0, 3).join('; ')}
        ). The site’s safety plan, local codes and licensed practice decide.
      </Text>
    </Card>
  );
}
