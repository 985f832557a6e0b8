import {
  BadRequestException,
  ConflictException,
  Inject,
  Injectable,
  NotFoundException,
  OnModuleInit,
  UnsupportedMediaTypeException,
} from '@nestjs/common';
import { InjectModel } from '@nestjs/sequelize';
import type { AttachmentSummary } from '@ostium/shared';
import { createHash, randomBytes } from 'node:crypto';
import { createReadStream, type ReadStream } from 'node:fs';
import { mkdir, stat, unlink, writeFile } from 'node:fs/promises';
import { isAbsolute, join, relative, resolve } from 'node:path';
import type { Transaction } from 'sequelize';
import { APP_CONFIG, type AppConfig } from '../config/configuration.js';
import { ReferralRow } from '../referrals/models/referral.model.js';
import type { UploadAttachmentDto } from './dto/upload-attachment.dto.js';
import { checkUploadContent, cleanFileName, defaultKind, MAX_UPLOAD_BYTES } from './file-check.util.js';
import { AttachmentRow } from './models/attachment.model.js';

export function mapAttachment(a: AttachmentRow): AttachmentSummary {
  return {
    id: a.id,
    referralId: a.referralId,
    fileName: a.originalName,
    mimeType: a.mimeType,
    sizeBytes: a.sizeBytes,
    kind: a.kind,
    createdAt: a.createdAt.toISOString(),
  };
}

export interface UploadedFile {
  buffer: Buffer;
  originalname?: string;
  size: number;
}

/** Stores uploads under config.uploadDir with random names; the database keeps what they are. */
@Injectable()
export class AttachmentsService implements OnModuleInit {
  readonly dir: string;

  constructor(
    @Inject(APP_CONFIG) config: AppConfig,
    @InjectModel(AttachmentRow) private readonly attachments: typeof AttachmentRow,
    @InjectModel(ReferralRow) private readonly referrals: typeof ReferralRow,
  ) {
    this.dir = resolve(config.uploadDir);
    if (config.clientDist) {
      // Files served as static assets would bypass sign-in and the content checks.
      const rel = relative(resolve(config.clientDist), this.dir);
      if (rel === '' || (!rel.startsWith('..') && !isAbsolute(rel))) throw new Error(`UPLOAD_DIR (${this.dir}) must not be inside the web root (${config.clientDist})`);
    }
  }

  async onModuleInit() {
    await mkdir(this.dir, { recursive: true, mode: 0o700 });
  }

  async upload(practiceId: number, userId: number | null, file: UploadedFile | undefined, dto: UploadAttachmentDto): Promise<AttachmentSummary> {
    if (!file) {
      throw new BadRequestException({ message: 'Choose a file to upload (multipart/form-data, field file)', errors: [{ field: 'file', message: 'is required' }] });
    }
    // multer enforces the limit while streaming; this guards callers that bypass it (seeds, other domains).
    if (file.size > MAX_UPLOAD_BYTES) throw new BadRequestException({ message: 'The file is larger than the 20 MB limit per file', errors: [{ field: 'file', message: 'too large' }] });
    const check = await checkUploadContent(file.buffer);
    if (!check.ok) throw new UnsupportedMediaTypeException({ message: check.message, errors: [{ field: 'file', message: check.detected ? `content is ${check.detected}` : 'unrecognised content' }] });
    if (dto.referralId !== undefined) await this.assertReferral(practiceId, dto.referralId);

    const storageName = randomBytes(16).toString('hex');
    const path = join(this.dir, storageName);
    await writeFile(path, file.buffer, { flag: 'wx', mode: 0o600 });
    try {
      const row = await this.attachments.create({
        practiceId,
        referralId: dto.referralId ?? null,
        kind: dto.kind ?? defaultKind(check.mime),
        originalName: cleanFileName(file.originalname),
        mimeType: check.mime,
        sizeBytes: file.buffer.length,
        sha256: createHash('sha256').update(file.buffer).digest('hex'),
        storageName,
        uploadedBy: userId,
      });
      return mapAttachment(row);
    } catch (e) {
      await unlink(path).catch(() => undefined);
      throw e;
    }
  }

  private async assertReferral(practiceId: number, referralId: number) {
    const n = await this.referrals.count({ where: { id: referralId, practiceId } });
    if (!n) throw new BadRequestException({ message: `Referral ${referralId} not found`, errors: [{ field: 'referralId', message: 'does not exist' }] });
  }

  async find(practiceId: number, id: number): Promise<AttachmentRow> {
    const a = await this.attachments.findOne({ where: { id, practiceId } });
    if (!a) throw new NotFoundException(`Attachment ${id} not found`);
    return a;
  }

  /** The stored file, for streaming to signed-in staff. */
  async open(practiceId: number, id: number): Promise<{ attachment: AttachmentRow; stream: ReadStream; size: number }> {
    const attachment = await this.find(practiceId, id);
    const path = join(this.dir, attachment.storageName);
    const s = await stat(path).catch(() => null);
    if (!s) throw new NotFoundException(`The content of attachment ${id} is missing from the file store`);
    return { attachment, stream: createReadStream(path), size: s.size };
  }

  async listForReferral(referralId: number, transaction?: Transaction): Promise<AttachmentSummary[]> {
    const rows = await this.attachments.findAll({ where: { referralId }, order: [['id', 'ASC']], transaction });
    return rows.map(mapAttachment);
  }

  /**
   * Links uploads made before the referral existed. Each id must be this practice's and not yet on
   * another referral; `field` names the request field in the error (e.g. attachmentIds).
   */
  async linkToReferral(practiceId: number, ids: number[], referralId: number, transaction: Transaction, field = 'attachmentIds'): Promise<void> {
    if (!ids.length) return;
    const rows = await this.attachments.findAll({ where: { practiceId, id: ids }, lock: transaction.LOCK.UPDATE, transaction });
    const byId = new Map(rows.map((r) => [r.id, r]));
    const errors: { field: string; message: string }[] = [];
    ids.forEach((id, i) => {
      const row = byId.get(id);
      if (!row) errors.push({ field: `${field}.${i}`, message: `attachment ${id} does not exist` });
      else if (row.referralId !== null && row.referralId !== referralId) errors.push({ field: `${field}.${i}`, message: `attachment ${id} already belongs to referral ${row.referralId}` });
    });
    if (errors.length) throw new BadRequestException({ message: errors.map((e) => e.message).join('; '), errors });
    for (const row of rows) {
      if (row.referralId === referralId) continue;
      row.referralId = referralId;
      await row.save({ transaction });
    }
  }

  /** Removes an upload that no referral uses yet (the user took it back off the intake form). */
  async removeUnlinked(practiceId: number, id: number): Promise<void> {
    const a = await this.find(practiceId, id);
    if (a.referralId !== null) throw new ConflictException(`Attachment ${id} belongs to referral ${a.referralId} and stays with it`);
    await a.destroy();
    await unlink(join(this.dir, a.storageName)).catch(() => undefined);
  }
}
