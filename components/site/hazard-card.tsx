import { hazardRadius, screeningWindMs } from '../../telemetry/math/ice-fall';
import { mToFt } from '../../telemetry/math/units';
import { palette } from '../theme/palette';
import { Card } from '../ui/screen';
import { Text } from '../ui/text';


export function HazardCard({ towerHeightM, reason }: { towerHeightM: number; reason: string }) {
  const hz = hazardRadius({ heightM: towerHeightM, windMs: screeningWindMs });
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2} style={{ color: palette.medium }}>Falling ice: keep clear</Text>
      <Text>{reason}. Screening radius around the tower: <Text strong>{hz.radiusM.toFixed(0)} m ({mToFt(hz.radiusM).toFixed(0)} ft)</Text>, for ice from {towerHeightM} m in a {screeningWindMs} m/s wind.</Text>
      <Text>Falling ice can kill. Wear a hard hat, agree a plan for where to stand and where to take cover under something sturdy before anyone goes near; a vehicle roof is not enough.</Text>
      <Text variant="small" muted>No published tower-specific formula exists: this is a screening figure ({hz.assumptions.slice(0, 3).join('; ')}). The site's safety plan, local codes and licensed practice decide.</Text>
    </Card>
  );
}
