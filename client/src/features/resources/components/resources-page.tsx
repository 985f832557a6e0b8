import { Tabs } from '@mantine/core';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { useResourcesView } from '../api/resources';
import { EquipmentPanel } from './equipment-panel';
import { LocationsPanel } from './locations-panel';
import { SchedulesPanel } from './schedules-panel';

/** /settings/resources — locations, chairs, microscopes and the endodontists' hours: what the time finder books into. */
export function ResourcesPage() {
  const view = useResourcesView();
  return (
    <>
      <PageHeader title="Resources" description="Locations and their hours, chairs, microscopes, and each endodontist's working hours, time off and holds." />
      <QueryState query={view}>
        {({ locations: ls, operators }) => (
          <Tabs defaultValue="locations" keepMounted={false}>
            <Tabs.List mb="md">
              <Tabs.Tab value="locations">Locations</Tabs.Tab>
              <Tabs.Tab value="equipment">Chairs and microscopes</Tabs.Tab>
              <Tabs.Tab value="schedules">Endodontist schedules</Tabs.Tab>
            </Tabs.List>
            <Tabs.Panel value="locations">
              <LocationsPanel locations={ls} />
            </Tabs.Panel>
            <Tabs.Panel value="equipment">
              <EquipmentPanel locations={ls} />
            </Tabs.Panel>
            <Tabs.Panel value="schedules">
              <SchedulesPanel locations={ls} operators={operators} />
            </Tabs.Panel>
          </Tabs>
        )}
      </QueryState>
    </>
  );
}
