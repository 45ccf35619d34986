import { Board } from '../../components/board/board';
import { useSites } from '../../components/data/sites';
import { QueryState } from '../../components/ui/query-state';
import { Screen } from '../../components/ui/screen';

export default function BoardRoute() {
  const sites = useSites();
  return (
    <Screen title="Board" full>
      <QueryState query={sites}>{(list) => <Board sites={list} />}</QueryState>
    </Screen>
  );
}
