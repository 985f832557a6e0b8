import type { Role } from './roles.types.js';

export interface LoginRequest {
  email: string;
  password: string;
}

export interface AuthUser {
  id: number;
  email: string;
  name: string;
  role: Role;
}

export interface LoginResponse {
  accessToken: string;
  user: AuthUser;
}

export interface UserSummary extends AuthUser {
  active: boolean;
  lastSignInAt: string | null;
  createdAt: string;
}

export interface CreateUserRequest {
  email: string;
  name: string;
  role: Role;
  password: string;
}

export interface UpdateUserRequest {
  name?: string;
  role?: Role;
  active?: boolean;
  password?: string;
}
