import { ImportPanel } from '@/components/imports/import-panel';
import { Screen } from '@/components/ui/screen';

export default function ImportControllersRoute() {
  return (
    <Screen title="Enrol controllers from a file">
      <ImportPanel kind="controllers" what="controller, naming its site by code and its antenna by name" />
    </Screen>
  );
}
