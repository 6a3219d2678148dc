import { listProfiles } from "@/lib/store/profiles";
import { FIELD_LABEL } from "../tests/[id]/columns/fieldChoices";
import { deleteProfileAction } from "./actions";
import { formatUtcMinute } from "@/lib/units";
import { pageAccess } from "../access";

export const dynamic = "force-dynamic";

export default async function ProfilesPage() {
  await pageAccess("/profiles");
  const profiles = listProfiles();
  return (
    <>
      <h1>Mapping profiles</h1>
      <p className="how">
        A mapping profile keeps the column choices made on a test&apos;s “How the file was read” page, by header, so the next file
        of the same layout is read the same way. Pick one on the upload form. Deleting a profile does not change tests already
        read with it.
      </p>
      {profiles.length === 0 ? (
        <p data-testid="no-profiles">
          No profiles saved yet. Open a test, choose “How the file was read”, change a column and save the choices as a profile.
        </p>
      ) : null}
      <div data-testid="profile-list">
        {profiles.map((p) => (
          <section key={p.id} className="panel" data-testid="profile">
            <div className="row" style={{ justifyContent: "space-between" }}>
              <h2 style={{ margin: 0, border: 0 }} data-testid="profile-title">
                {p.name}
              </h2>
              <form action={deleteProfileAction}>
                <input type="hidden" name="name" value={p.name} />
                <button type="submit" className="secondary" data-testid="delete-profile">
                  Delete
                </button>
              </form>
            </div>
            <p className="how">saved {formatUtcMinute(p.createdAt)}</p>
            <table>
              <thead>
                <tr>
                  <th>Header in the file</th>
                  <th>Read as</th>
                  <th>Unit</th>
                </tr>
              </thead>
              <tbody>
                {Object.entries(p.mapping).map(([header, o]) => (
                  <tr key={header}>
                    <td>{header}</td>
                    <td>{o.field ? FIELD_LABEL[o.field] : "ignored"}</td>
                    <td>{o.field ? (o.unit ?? "judged from the file") : "—"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </section>
        ))}
      </div>
    </>
  );
}
