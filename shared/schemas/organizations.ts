/** An employer's organization, as the API returns it. */
export interface Organization {
  id: number;
  name: string;
}
