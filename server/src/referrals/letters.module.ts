import { Module } from '@nestjs/common';
import { SequelizeModule } from '@nestjs/sequelize';
import { EstimatesModule } from '../estimates/estimates.module.js';
import { CompletionController } from './completion.controller.js';
import { CompletionService } from './completion.service.js';
import { LetterComposerService } from './letter-composer.service.js';
import { LetterJobsService } from './letter-jobs.service.js';
import { LettersController } from './letters.controller.js';
import { CaseCompletionRow } from './models/case-completion.model.js';
import { ReferralsModule } from './referrals.module.js';

/**
 * Letters that are about visits (booking notice, completion report) and the outbox's `letter` composer.
 * A module of its own above scheduling: it listens to booking events and reads visits, while scheduling
 * imports ReferralsModule — so this cannot live in ReferralsModule without an import circle. The letter
 * rows themselves stay with LettersService in ReferralsModule (the acknowledgement is queued at intake).
 */
@Module({
  imports: [SequelizeModule.forFeature([CaseCompletionRow]), ReferralsModule, EstimatesModule],
  controllers: [CompletionController, LettersController],
  providers: [CompletionService, LetterComposerService, LetterJobsService],
  exports: [CompletionService, LetterJobsService],
})
export class LettersModule {}
