// Short lists for the pickers of the planner's reports and forms.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';

export interface Choice {
  id: number;
  name: string;
}

export async function customerChoices(): Promise<Choice[]> {
  return sequelize.query<Choice>(`SELECT id, name FROM organisations WHERE kind = 'customer' ORDER BY name`, { type: QueryTypes.SELECT });
}

export interface DepotChoice extends Choice {
  code: string;
  kind: 'depot';
}

/** The depots people may pick (report filters, the load page, the bin forms): active ones only, by name. */
export async function depotChoices(): Promise<DepotChoice[]> {
  return sequelize.query<DepotChoice>(`SELECT id, name, code, kind FROM sites WHERE kind = 'depot' AND active ORDER BY name`, { type: QueryTypes.SELECT });
}
