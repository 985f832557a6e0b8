import { Injectable, Logger } from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { LetterSummary } from '@ostium/shared';
import type { Transaction } from 'sequelize';
import { Location } from '../practices/models/location.model.js';
import { PatientRow } from '../patients/models/patient.model.js';
import { PracticesService } from '../practices/practices.service.js';
import { ReferringDentistRow } from '../referring-dentists/models/referring-dentist.model.js';
import { MailService } from '../mail/mail.service.js';
import { composeAcknowledgement } from './acknowledgement-letter.util.js';
import { LetterRow } from './models/letter.model.js';
import { ReferralRow } from './models/referral.model.js';

export function mapLetter(l: LetterRow): LetterSummary {
  return { id: l.id, kind: l.kind, to: l.toAddress, subject: l.subject, status: l.status, detail: l.detail, at: l.at.toISOString() };
}

/** Letters to referring dentists, each logged on its referral with what happened to it. */
@Injectable()
export class LettersService {
  private readonly logger = new Logger('Letters');

  constructor(
    private readonly mail: MailService,
    private readonly practices: PracticesService,
    @InjectModel(LetterRow) private readonly letters: typeof LetterRow,
    @InjectModel(ReferralRow) private readonly referrals: typeof ReferralRow,
  ) {}

  async listForReferral(referralId: number, transaction?: Transaction): Promise<LetterSummary[]> {
    const rows = await this.letters.findAll({ where: { referralId }, order: [['at', 'ASC'], ['id', 'ASC']], transaction });
    return rows.map(mapLetter);
  }

  /**
   * E-mails the acknowledgement to the referring dentist and logs it. Call after the referral's
   * transaction has committed: the letter's fate never decides whether the referral exists.
   */
  async sendAcknowledgement(practiceId: number, referralId: number): Promise<LetterSummary> {
    const r = await this.referrals.findOne({
      where: { id: referralId, practiceId },
      include: [
        { model: PatientRow, as: 'patient' },
        { model: ReferringDentistRow, as: 'referringDentist' },
        { model: Location, as: 'location' },
      ],
    });
    if (!r || !r.patient || !r.referringDentist || !r.location) throw new Error(`referral ${referralId} not found for its acknowledgement`);
    const practice = await this.practices.get(practiceId);
    const letter = composeAcknowledgement({
      practice: { name: practice.name, phone: practice.phone, email: practice.email },
      location: { name: r.location.name, address: r.location.address, phone: r.location.phone },
      dentist: { name: r.referringDentist.name },
      patient: { firstName: r.patient.firstName, lastName: r.patient.lastName },
      receivedOn: r.receivedOn,
    });
    const dentist = r.referringDentist;
    const log = (v: { toAddress: string; status: LetterSummary['status']; detail: string | null; messageId?: string | null }) =>
      this.letters.create({ practiceId, referralId, kind: 'acknowledgement', subject: letter.subject, at: new Date(), messageId: null, ...v });

    if (!dentist.email) {
      return mapLetter(await log({ toAddress: dentist.name, status: 'skipped', detail: 'no e-mail address on file for the referring dentist' }));
    }
    if (dentist.letterChannel !== 'email') {
      return mapLetter(
        await log({ toAddress: dentist.email, status: 'skipped', detail: `the referring dentist prefers letters by ${dentist.letterChannel}; send it that way` }),
      );
    }
    const result = await this.mail.send({ to: dentist.email, subject: letter.subject, text: letter.text, html: letter.html });
    if (!result.ok) this.logger.warn(`acknowledgement for referral ${referralId} failed: ${result.error}`);
    return mapLetter(
      await log({
        toAddress: dentist.email,
        status: result.ok ? 'sent' : 'failed',
        detail: result.ok ? null : (result.error ?? 'sending failed').slice(0, 1000),
        messageId: result.messageId ?? null,
      }),
    );
  }
}
