import { Column, Entity, PrimaryColumn } from 'typeorm';

/** Server-wide values kept with the data, e.g. the generated session secret outside production. */
@Entity({ name: 'app_settings' })
export class AppSetting {
  @PrimaryColumn({ type: 'text' })
  key: string;

  @Column({ type: 'text' })
  value: string;
}
