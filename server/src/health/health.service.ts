import { Injectable } from '@nestjs/common';
import { QueryTypes } from 'sequelize';
import { Sequelize } from 'sequelize-typescript';

@Injectable()
export class HealthService {
  constructor(private readonly sequelize: Sequelize) {}

  /** A trivial query with a deadline; the connection pool reconnects on its own once MariaDB is back. */
  async databaseUp(timeoutMs = 2_000): Promise<boolean> {
    let timer: NodeJS.Timeout | undefined;
    const deadline = new Promise<false>((resolve) => (timer = setTimeout(() => resolve(false), timeoutMs)));
    try {
      return await Promise.race([this.sequelize.query('SELECT 1 AS ok', { type: QueryTypes.SELECT }).then(() => true as const), deadline]);
    } catch {
      return false;
    } finally {
      clearTimeout(timer);
    }
  }
}
