import { Module } from '@nestjs/common';
import { PracticesModule } from '../practices/practices.module.js';
import { UsersModule } from '../users/users.module.js';
import { SeedsService } from './seeds.service.js';

@Module({ imports: [PracticesModule, UsersModule], providers: [SeedsService], exports: [SeedsService] })
export class SeedsModule {}
