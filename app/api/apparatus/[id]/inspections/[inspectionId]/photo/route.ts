// GET /api/apparatus/[id]/inspections/[inspectionId]/photo — a record's photo, for anyone who reads
// the apparatus (its real type, nosniff, images inline).
// POST … — adds the record's one photo (multipart/form-data, field "file"): the attachment rules —
// JPEG, PNG, WebP or PDF read from the content, at most 10 MB.
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_REQUEST_MAX_BYTES, formatBytes } from "@/lib/applications/limits";
import { route } from "@/lib/http/route";
import { fileResponse, fileTooLarge, readUploadedFile } from "@/lib/http/upload";
import { addInspectionPhoto, assertCanKeepUp, readInspectionPhoto } from "@/lib/upkeep/actions";

const ids = { id: "That apparatus", inspectionId: "That record" };
const each = `each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}`;

export const GET = route({ ids, access: "apparatus.read" }, async ({ request, user, params }) =>
  fileResponse(
    await readInspectionPhoto(user, params.id, params.inspectionId),
    new URL(request.url).searchParams.get("download") === "1",
  ),
);

export const POST = route(
  {
    ids,
    access: "apparatus.read",
    rawBody: {
      maxBytes: ATTACHMENT_REQUEST_MAX_BYTES,
      tooLarge: () => fileTooLarge(`The file is larger than ${formatBytes(ATTACHMENT_MAX_BYTES)}; ${each}.`),
    },
  },
  async ({ request, readRawBody, user, params }) => {
    await assertCanKeepUp(user, params.id);
    const file = await readUploadedFile(request, readRawBody, {
      maxBytes: ATTACHMENT_MAX_BYTES,
      message: (size) => `The file is ${formatBytes(size)}; ${each}.`,
    });
    return Response.json(
      { photo: await addInspectionPhoto(user, params.id, params.inspectionId, file) },
      { status: 201 },
    );
  },
);
