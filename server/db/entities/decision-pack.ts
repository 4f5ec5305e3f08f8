import { Column, Entity, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { Decision } from './decision';

/**
 * The committee pack (PDF) made when the decision was recorded, kept with the decision: the bytes
 * the committee decided on and their SHA-256 (also in the `comparison.pack_archived` audit event).
 * One per decision; never changed or removed (database triggers refuse both).
 */
@Entity({ name: 'decision_packs' })
export class DecisionPack {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Column({ type: 'integer', unique: true })
  decisionId: number;

  @ManyToOne(() => Decision, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'decisionId' })
  decision: Decision;

  @Column({ type: 'integer' })
  comparisonId: number;

  @Column({ type: 'text' })
  sha256: string;

  @Column({ type: 'integer' })
  bytes: number;

  @Column({ type: 'blob' })
  pdf: Buffer;

  @Column({ type: 'datetime' })
  createdAt: Date;
}
