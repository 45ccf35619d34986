import { ImportPanel } from '@/components/imports/import-panel';
import { Screen } from '@/components/ui/screen';

export default function ImportSitesRoute() {
  return (
    <Screen title="Import sites and antennas">
      <ImportPanel
        kind="network"
        what={'site (record "site") or antenna (record "antenna", naming its site by code)'}
      />
    </Screen>
  );
}
