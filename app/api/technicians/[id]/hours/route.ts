import { route } from "@/lib/http/route";
import { getTechnicianHours, putTechnicianHours } from "@/lib/visits/technicians";
import { technicianHoursSchema, visitIdParams } from "@/lib/validation/visits";

export const dynamic = "force-dynamic";

/** GET /api/technicians/[id]/hours: staff, or the technician themself (lib/visits decides). */
export const GET = route({ roles: ["admin", "staff", "technician"], params: visitIdParams }, ({ actor, params }) => getTechnicianHours(actor, params.id));

/** PUT /api/technicians/[id]/hours { hours: [{ weekday, start, end }], timeOff: [{ date, start?, end?, note }] } (admin, staff; lib/visits decides). */
export const PUT = route({ roles: ["admin", "staff", "technician"], params: visitIdParams, body: technicianHoursSchema }, ({ actor, params, body }) => putTechnicianHours(actor, params.id, body));
