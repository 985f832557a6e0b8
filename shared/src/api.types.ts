/** Every error the API returns has this body. `errors` names each bad field. */
export interface ApiErrorBody {
  statusCode: number;
  message: string;
  errors?: { field: string; message: string }[];
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

export interface HealthResponse {
  status: 'ok' | 'degraded';
  database: 'up' | 'down';
}

export interface AuditEntry {
  id: number;
  at: string;
  userId: number | null;
  userEmail: string | null;
  action: 'create' | 'update' | 'delete';
  entity: string;
  entityId: string;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
  requestId: string | null;
}
