import { SelectField } from "@/components/ui/field";

/** The entity a screen shows, chosen from the list ("LKS-EU · Larkspur Bank Europe"); shown once there is one. */
export function EntitySelect({
  entities,
  value,
  onChoose,
}: {
  entities: readonly { code: string; name: string }[];
  value: string;
  onChoose: (code: string) => void;
}) {
  if (entities.length === 0) return null;
  return (
    <SelectField label="Entity" value={value} onChange={(e) => onChoose(e.target.value)} className="w-72">
      {entities.map((e) => (
        <option key={e.code} value={e.code}>
          {e.code} · {e.name}
        </option>
      ))}
    </SelectField>
  );
}
