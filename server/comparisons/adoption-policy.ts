import type { AdoptionPolicy } from '@shared/policy';
import type { DataSource, EntityManager } from 'typeorm';
import { currentPolicy } from '../policy/service';

/**
 * The adoption policy a new analysis run is judged under (its report carries the policy and its
 * version): the newest stored version of the admin-editable, versioned policy (policy/service.ts).
 */
export async function currentAdoptionPolicy(source: DataSource | EntityManager): Promise<AdoptionPolicy> {
  return currentPolicy(source);
}
