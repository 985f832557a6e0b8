import { Injectable } from '@nestjs/common';
import type { OpeningHours, PracticeSettings, Role } from '@ostium/shared';
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { PracticesService } from '../practices/practices.service.js';
import { UsersService } from '../users/users.service.js';

interface DemoPractice {
  practice: { name: string; phone?: string; email?: string; settings?: Partial<PracticeSettings> };
  locations: {
    name: string;
    address?: string;
    phone?: string;
    timeZone: string;
    openingHours: OpeningHours;
    microscopes: { name: string; mobile: boolean; fixedToChair?: string }[];
    chairs: string[];
  }[];
  demoPassword: string;
  users: { email: string; name: string; role: Role }[];
}

/** Loads the demo practice from seeds/ through the domain services; safe to run again. */
@Injectable()
export class SeedsService {
  constructor(
    private readonly practices: PracticesService,
    private readonly users: UsersService,
  ) {}

  async loadDemo({ ifEmpty = false, dir }: { ifEmpty?: boolean; dir?: string } = {}): Promise<string> {
    if (ifEmpty && (await this.practices.count()) > 0) return 'database already holds a practice; nothing loaded';
    const seedsDir = dir ?? join(process.cwd(), 'seeds');
    const demo: DemoPractice = JSON.parse(await readFile(join(seedsDir, 'demo', 'practice.json'), 'utf8'));
    const practice = await this.practices.ensurePractice(demo.practice);
    let chairs = 0;
    for (const l of demo.locations) {
      const location = await this.practices.ensureLocation(practice.id, l);
      const fixed = new Map<string, number>();
      for (const m of l.microscopes) {
        const scope = await this.practices.ensureMicroscope(practice.id, location.id, m);
        if (m.fixedToChair) fixed.set(m.fixedToChair, scope.id);
      }
      for (const name of l.chairs) {
        await this.practices.ensureChair(practice.id, location.id, { name, fixedMicroscopeId: fixed.get(name) ?? null });
        chairs++;
      }
    }
    let created = 0;
    for (const u of demo.users) {
      if (await this.users.findByEmail(u.email)) continue;
      await this.users.create(practice.id, { ...u, password: demo.demoPassword });
      created++;
    }
    return `practice "${practice.name}", ${demo.locations.length} locations, ${chairs} chairs, ${created} new users`;
  }
}
