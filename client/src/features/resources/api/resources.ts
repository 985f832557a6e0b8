import type {
  ChairInput,
  ChairSummary,
  Closure,
  ClosureInput,
  Hold,
  HoldInput,
  LocationInput,
  LocationResource,
  MicroscopeInput,
  MicroscopeSummary,
  SchedulingResourcesView,
  TimeOff,
  TimeOffInput,
  WorkingRule,
  WorkingRuleInput,
} from '@ostium/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { practiceKeys } from '../../practice/api/practice';

/**
 * Every admin path of the resources screens in one place (server/src/scheduling/resources.controller.ts):
 * creation is nested under its owner, changes (PUT, the whole row) and removals go to the row itself.
 */
export const RESOURCE_PATHS = {
  view: () => '/scheduling/resources',
  locations: () => '/locations',
  location: (id: number) => `/locations/${id}`,
  closures: (locationId: number) => `/locations/${locationId}/closures`,
  closure: (id: number) => `/closures/${id}`,
  chairs: (locationId: number) => `/locations/${locationId}/chairs`,
  chair: (id: number) => `/chairs/${id}`,
  microscopes: (locationId: number) => `/locations/${locationId}/microscopes`,
  microscope: (id: number) => `/microscopes/${id}`,
  workingRules: (operatorId: number) => `/operators/${operatorId}/working-rules`,
  workingRule: (id: number) => `/working-rules/${id}`,
  timeOffs: (operatorId: number) => `/operators/${operatorId}/time-off`,
  timeOff: (id: number) => `/time-off/${id}`,
  holds: () => '/holds',
  hold: (id: number) => `/holds/${id}`,
};

export const resourceKeys = {
  all: ['resources'] as const,
  view: () => [...resourceKeys.all, 'view'] as const,
};

/** Locations with hours, closures, chairs and microscopes, and every endodontist's schedule, in one read. */
export const resourcesViewQuery = () => queryOptions({ queryKey: resourceKeys.view(), queryFn: () => api<SchedulingResourcesView>(RESOURCE_PATHS.view()) });
export const useResourcesView = () => useQuery(resourcesViewQuery());

/** A mutation that refreshes the admin lists and everything else that shows locations (board, intake). */
function useResourceMutation<V, R>(fn: (v: V) => Promise<R>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: resourceKeys.all });
      void qc.invalidateQueries({ queryKey: practiceKeys.locations() });
    },
  });
}

export const useSaveLocation = () =>
  useResourceMutation(({ id, body }: { id?: number; body: LocationInput }) =>
    id ? api<LocationResource>(RESOURCE_PATHS.location(id), { method: 'PUT', body }) : api<LocationResource>(RESOURCE_PATHS.locations(), { method: 'POST', body }),
  );
export const useAddClosure = () => useResourceMutation(({ locationId, body }: { locationId: number; body: ClosureInput }) => api<Closure>(RESOURCE_PATHS.closures(locationId), { method: 'POST', body }));
export const useDeleteClosure = () => useResourceMutation((id: number) => api<void>(RESOURCE_PATHS.closure(id), { method: 'DELETE' }));

export const useSaveChair = () =>
  useResourceMutation(({ id, locationId, body }: { id?: number; locationId: number; body: ChairInput }) =>
    id ? api<ChairSummary>(RESOURCE_PATHS.chair(id), { method: 'PUT', body }) : api<ChairSummary>(RESOURCE_PATHS.chairs(locationId), { method: 'POST', body }),
  );
export const useDeleteChair = () => useResourceMutation((id: number) => api<{ retired: boolean } | void>(RESOURCE_PATHS.chair(id), { method: 'DELETE' }));

export const useSaveMicroscope = () =>
  useResourceMutation(({ id, locationId, body }: { id?: number; locationId: number; body: MicroscopeInput }) =>
    id ? api<MicroscopeSummary>(RESOURCE_PATHS.microscope(id), { method: 'PUT', body }) : api<MicroscopeSummary>(RESOURCE_PATHS.microscopes(locationId), { method: 'POST', body }),
  );
export const useDeleteMicroscope = () => useResourceMutation((id: number) => api<{ retired: boolean } | void>(RESOURCE_PATHS.microscope(id), { method: 'DELETE' }));

export const useSaveWorkingRule = () =>
  useResourceMutation(({ id, operatorId, body }: { id?: number; operatorId: number; body: WorkingRuleInput }) =>
    id ? api<WorkingRule>(RESOURCE_PATHS.workingRule(id), { method: 'PUT', body }) : api<WorkingRule>(RESOURCE_PATHS.workingRules(operatorId), { method: 'POST', body }),
  );
export const useDeleteWorkingRule = () => useResourceMutation((id: number) => api<void>(RESOURCE_PATHS.workingRule(id), { method: 'DELETE' }));

export const useAddTimeOff = () => useResourceMutation(({ operatorId, body }: { operatorId: number; body: TimeOffInput }) => api<TimeOff>(RESOURCE_PATHS.timeOffs(operatorId), { method: 'POST', body }));
export const useDeleteTimeOff = () => useResourceMutation((id: number) => api<void>(RESOURCE_PATHS.timeOff(id), { method: 'DELETE' }));

export const useAddHold = () => useResourceMutation((body: HoldInput) => api<Hold>(RESOURCE_PATHS.holds(), { method: 'POST', body }));
export const useDeleteHold = () => useResourceMutation((id: number) => api<void>(RESOURCE_PATHS.hold(id), { method: 'DELETE' }));
