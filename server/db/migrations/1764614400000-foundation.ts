import type { MigrationInterface, QueryRunner } from 'typeorm';
import { appendOnly, dropAppendOnly, portableQuery } from './portable';

/**
 * People, one-time links, the audit trail, the outbox, sessions and settings.
 * Constraint and index names are the ones TypeORM derives from the entities, so that its schema
 * diff after this migration is empty (tests/unit/schema.test.ts checks it).
 */
export class Foundation1764614400000 implements MigrationInterface {
  name = 'Foundation1764614400000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(queryRunner, `CREATE TABLE "app_settings" ("key" text PRIMARY KEY NOT NULL, "value" text NOT NULL)`);
    await portableQuery(queryRunner,
      `CREATE TABLE "users" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "email" text NOT NULL, "name" text NOT NULL, ` +
        `"passwordHash" text, "roles" text NOT NULL, "active" boolean NOT NULL DEFAULT (0), "createdAt" datetime NOT NULL, ` +
        `CONSTRAINT "UQ_97672ac88f789774dd47f7c8be3" UNIQUE ("email"))`,
    );
    await portableQuery(queryRunner,
      `CREATE TABLE "one_time_tokens" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "userId" integer NOT NULL, ` +
        `"purpose" text NOT NULL, "tokenHash" text NOT NULL, "createdAt" datetime NOT NULL, "expiresAt" datetime NOT NULL, ` +
        `"usedAt" datetime, CONSTRAINT "UQ_3cd7ae667bfe489f39288fe9964" UNIQUE ("tokenHash"), ` +
        `CONSTRAINT "FK_c050f9d5e8a16e1a30a98c7257f" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_c050f9d5e8a16e1a30a98c7257" ON "one_time_tokens" ("userId")`);
    await portableQuery(queryRunner,
      `CREATE TABLE "audit_events" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "actorId" integer, "action" text NOT NULL, ` +
        `"targetType" text NOT NULL, "targetId" text, "details" text NOT NULL, "createdAt" datetime NOT NULL, ` +
        `"prevHash" text NOT NULL, "hash" text NOT NULL, CONSTRAINT "UQ_dd4e005a38b7965794e8d2b1472" UNIQUE ("hash"), ` +
        `CONSTRAINT "FK_9e76ea4cc84a0e407c5a3aeb054" FOREIGN KEY ("actorId") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_87f9b612659a62dcd4fcf68c85" ON "audit_events" ("targetType", "targetId")`);
    // Append-only: the database itself refuses to change or remove an audit event.
    await appendOnly(queryRunner, 'audit_events', 'audit events are append-only');
    await portableQuery(queryRunner,
      `CREATE TABLE "mail_messages" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "to" text NOT NULL, "subject" text NOT NULL, ` +
        `"text" text NOT NULL, "status" text NOT NULL, "attempts" integer NOT NULL DEFAULT (0), "lastError" text, ` +
        `"nextAttemptAt" datetime, "createdAt" datetime NOT NULL, "sentAt" datetime, "messageId" text, "receivedAt" datetime, ` +
        `"envelopeFrom" text, "envelopeTo" text, "receivedText" text)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_b03eb599698887abf097b18ab6" ON "mail_messages" ("createdAt")`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_e943f011105d33468e4c3d6a90" ON "mail_messages" ("status", "nextAttemptAt")`);
    await portableQuery(queryRunner,
      `CREATE TABLE "sessions" ("sid" text PRIMARY KEY NOT NULL, "data" text NOT NULL, "expiresAt" datetime NOT NULL, "userId" integer, ` +
        `CONSTRAINT "FK_57de40bc620f456c7311aa3a1e6" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_50762206f116cd47d1c3fec396" ON "sessions" ("expiresAt")`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_57de40bc620f456c7311aa3a1e" ON "sessions" ("userId")`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(queryRunner, `DROP TABLE "sessions"`);
    await portableQuery(queryRunner, `DROP TABLE "mail_messages"`);
    await dropAppendOnly(queryRunner, 'audit_events');
    await portableQuery(queryRunner, `DROP TABLE "audit_events"`);
    await portableQuery(queryRunner, `DROP TABLE "one_time_tokens"`);
    await portableQuery(queryRunner, `DROP TABLE "users"`);
    await portableQuery(queryRunner, `DROP TABLE "app_settings"`);
  }
}
