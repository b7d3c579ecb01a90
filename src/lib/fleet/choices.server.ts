// Short lists for the filter forms of the planner's reports.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';

export interface Choice {
  id: number;
  name: string;
}

export async function customerChoices(): Promise<Choice[]> {
  return sequelize.query<Choice>(`SELECT id, name FROM organisations WHERE kind = 'customer' ORDER BY name`, { type: QueryTypes.SELECT });
}

export async function depotChoices(): Promise<Choice[]> {
  return sequelize.query<Choice>(`SELECT id, name FROM sites WHERE kind = 'depot' ORDER BY name`, { type: QueryTypes.SELECT });
}
