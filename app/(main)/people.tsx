import { usePeople } from '../../components/data/people';
import { PeopleList } from '../../components/people/people-list';
import { QueryState } from '../../components/ui/query-state';
import { Screen } from '../../components/ui/screen';

export default function PeopleRoute() {
  const people = usePeople();
  return (
    <Screen title="People">
      <QueryState query={people}>{(list) => <PeopleList people={list} />}</QueryState>
    </Screen>
  );
}
