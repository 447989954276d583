import { relations, sql } from "drizzle-orm";
import { blob, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";

// Every timestamp is stored as UTC milliseconds since the epoch; dates without a time (birth dates, precaution
// windows) are ISO 8601 `YYYY-MM-DD` strings.
const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());
const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date());
const updatedAt = () =>
  integer("updated_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date());

export const ROLES = ["admin", "therapist", "assistant", "client"] as const;
export type Role = (typeof ROLES)[number];
export const STAFF_ROLES = ["admin", "therapist", "assistant"] as const satisfies readonly Role[];
export const CLINICAL_ROLES = ["therapist", "assistant"] as const satisfies readonly Role[];

export const clinics = sqliteTable("clinics", {
  id: id(),
  name: text("name").notNull(),
  timezone: text("timezone").notNull().default("UTC"),
  /** Which published table of normal active range is the default reference (see lib/motions). */
  normTable: text("norm_table").notNull().default("aaos1965"),
  /** Grading scale offered first: daniels | mrc | intrinsic. */
  gradeScale: text("grade_scale").notNull().default("daniels"),
  /** Share of the reference range that counts as "full range" for grading, in percent. */
  fullRangePercent: integer("full_range_percent").notNull().default(90),
  contactEmail: text("contact_email"),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

export const users = sqliteTable(
  "users",
  {
    id: id(),
    clinicId: text("clinic_id").references(() => clinics.id, { onDelete: "restrict" }),
    name: text("name"),
    email: text("email").notNull().unique(),
    emailVerified: integer("email_verified", { mode: "timestamp_ms" }),
    image: text("image"),
    role: text("role", { enum: ROLES }).notNull().default("client"),
    /** argon2id; null until a staff member sets a password from their invitation (clients sign in by link). */
    passwordHash: text("password_hash"),
    active: integer("active", { mode: "boolean" }).notNull().default(true),
    lastSignInAt: integer("last_sign_in_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("users_clinic_idx").on(t.clinicId)],
);

// Auth.js adapter tables (shapes required by @auth/drizzle-adapter).
export const accounts = sqliteTable(
  "accounts",
  {
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    type: text("type").$type<"email" | "oauth" | "oidc" | "webauthn">().notNull(),
    provider: text("provider").notNull(),
    providerAccountId: text("provider_account_id").notNull(),
    refresh_token: text("refresh_token"),
    access_token: text("access_token"),
    expires_at: integer("expires_at"),
    token_type: text("token_type"),
    scope: text("scope"),
    id_token: text("id_token"),
    session_state: text("session_state"),
  },
  (t) => [primaryKey({ columns: [t.provider, t.providerAccountId] }), index("accounts_user_idx").on(t.userId)],
);

export const sessions = sqliteTable(
  "sessions",
  {
    sessionToken: text("session_token").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expires: integer("expires", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

export const verificationTokens = sqliteTable(
  "verification_tokens",
  {
    identifier: text("identifier").notNull(),
    token: text("token").notNull(),
    expires: integer("expires", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.identifier, t.token] })],
);

/** One-time links for staff: set a password from an invitation, or reset it. Only the SHA-256 of the token is kept. */
export const passwordTokens = sqliteTable(
  "password_tokens",
  {
    tokenHash: text("token_hash").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    purpose: text("purpose", { enum: ["invite", "reset"] }).notNull(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("password_tokens_user_idx").on(t.userId)],
);

/** Failed sign-in counters, keyed by account (`account:<email>`) and by address (`address:<ip>`). */
export const signInThrottle = sqliteTable("sign_in_throttle", {
  key: text("key").primaryKey(),
  failures: integer("failures").notNull().default(0),
  windowStartedAt: integer("window_started_at", { mode: "timestamp_ms" }).notNull(),
  lockedUntil: integer("locked_until", { mode: "timestamp_ms" }),
});

export const PRECAUTION_FLAGS = [
  "no_resisted_testing",
  "unhealed_fracture",
  "tendon_repair",
  "ligament_or_capsule_repair",
  "joint_instability",
  "osteoporosis",
  "acute_inflammation_or_infection",
  "cardiovascular",
  "bleeding_disorder",
  "reduced_sensation",
] as const;
export type PrecautionFlag = (typeof PRECAUTION_FLAGS)[number];

export const SIDES = ["left", "right"] as const;
export const AFFECTED_SIDES = ["left", "right", "both"] as const;
export const SEXES = ["female", "male", "other", "unknown"] as const;

/** The clinic's record of a person it treats. A client may (or may not yet) have a sign-in account. */
export const clients = sqliteTable(
  "clients",
  {
    id: id(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    userId: text("user_id")
      .unique()
      .references(() => users.id, { onDelete: "set null" }),
    givenName: text("given_name").notNull(),
    familyName: text("family_name").notNull(),
    email: text("email"),
    dateOfBirth: text("date_of_birth").notNull(),
    /** Used only to pick age- and sex-matched grip and pinch norms. */
    sex: text("sex", { enum: SEXES }).notNull().default("unknown"),
    dominantHand: text("dominant_hand", { enum: SIDES }).notNull(),
    affectedSide: text("affected_side", { enum: AFFECTED_SIDES }).notNull(),
    diagnosisNote: text("diagnosis_note").notNull().default(""),
    referringPhysician: text("referring_physician").notNull().default(""),
    precautionFlags: text("precaution_flags", { mode: "json" }).$type<PrecautionFlag[]>().notNull().default(sql`'[]'`),
    precautionNote: text("precaution_note").notNull().default(""),
    /** No resisted testing before this date (inclusive end of the window is the day before). */
    noResistedUntil: text("no_resisted_until"),
    primaryTherapistId: text("primary_therapist_id").references(() => users.id, { onDelete: "set null" }),
    selfPay: integer("self_pay", { mode: "boolean" }).notNull().default(false),
    archivedAt: integer("archived_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("clients_clinic_idx").on(t.clinicId),
    index("clients_therapist_idx").on(t.primaryTherapistId),
    index("clients_clinic_family_idx").on(t.clinicId, t.familyName),
  ],
);

/** Append-only record of sign-ins and of every access to clinical records. */
export const auditEvents = sqliteTable(
  "audit_events",
  {
    id: id(),
    at: integer("at", { mode: "timestamp_ms" })
      .notNull()
      .$defaultFn(() => new Date()),
    clinicId: text("clinic_id").references(() => clinics.id, { onDelete: "set null" }),
    actorUserId: text("actor_user_id").references(() => users.id, { onDelete: "set null" }),
    actorRole: text("actor_role"),
    /** Dotted verb, e.g. `auth.sign_in`, `client.read`, `client.update`, `staff.invite`. */
    action: text("action").notNull(),
    subjectType: text("subject_type"),
    subjectId: text("subject_id"),
    clientId: text("client_id").references(() => clients.id, { onDelete: "set null" }),
    address: text("address"),
    detail: text("detail", { mode: "json" }).$type<Record<string, unknown>>(),
  },
  (t) => [
    index("audit_clinic_at_idx").on(t.clinicId, t.at),
    index("audit_actor_idx").on(t.actorUserId),
    index("audit_client_idx").on(t.clientId),
  ],
);

// ---------------------------------------------------------------------------------------------------------------
// Clinical measurements. Motion ids, digits and conditions are those of lib/motions/catalog.ts.

export const CONDITIONS = ["against_gravity", "gravity_minimized"] as const;
export const DIGIT_NAMES = ["thumb", "index", "middle", "ring", "little"] as const;
export const ATTEMPT_SOURCES = ["self_check", "visit", "practice", "upload"] as const;
export const VISIT_KINDS = ["video", "in_person"] as const;
export const VISIT_STATUSES = ["scheduled", "waiting", "in_progress", "finished", "cancelled", "missed"] as const;
export type VisitStatus = (typeof VISIT_STATUSES)[number];

/** Telehealth and in-person visits. A video visit's room name is derived from its id, never chosen by a caller. */
export const visits = sqliteTable(
  "visits",
  {
    id: id(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "restrict" }),
    therapistId: text("therapist_id")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    kind: text("kind", { enum: VISIT_KINDS }).notNull().default("video"),
    startsAt: integer("starts_at", { mode: "timestamp_ms" }).notNull(),
    durationMin: integer("duration_min").notNull().default(45),
    reason: text("reason").notNull().default(""),
    /** In-person visits: where. */
    location: text("location"),
    /** In-person follow-up tests: which motions to test, as `{motion, side, digit}` objects. */
    plannedTests: text("planned_tests", { mode: "json" }).$type<{ motion: string; side: string; digit: string | null }[]>(),
    status: text("status", { enum: VISIT_STATUSES }).notNull().default("scheduled"),
    invitationSentAt: integer("invitation_sent_at", { mode: "timestamp_ms" }),
    reminderSentAt: integer("reminder_sent_at", { mode: "timestamp_ms" }),
    startedAt: integer("started_at", { mode: "timestamp_ms" }),
    endedAt: integer("ended_at", { mode: "timestamp_ms" }),
    notes: text("notes").notNull().default(""),
    summary: text("summary", { mode: "json" }).$type<Record<string, unknown>>(),
    createdByUserId: text("created_by_user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("visits_clinic_starts_idx").on(t.clinicId, t.startsAt),
    index("visits_client_idx").on(t.clientId),
    index("visits_therapist_starts_idx").on(t.therapistId, t.startsAt),
  ],
);

/** Signed consents (e.g. telehealth) with the exact version of the text that was shown. */
export const consents = sqliteTable(
  "consents",
  {
    id: id(),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: ["telehealth"] }).notNull(),
    version: text("version").notNull(),
    /** SHA-256 of the text shown, so the wording agreed to can be proven later. */
    textSha256: text("text_sha256").notNull(),
    signedName: text("signed_name").notNull(),
    signedByUserId: text("signed_by_user_id").references(() => users.id, { onDelete: "set null" }),
    signedAt: integer("signed_at", { mode: "timestamp_ms" }).notNull(),
    address: text("address"),
  },
  (t) => [index("consents_client_idx").on(t.clientId)],
);

/**
 * One recorded attempt at a motion. Every number here is computed on the server from the raw capture with the
 * measurement engine; the browser's own numbers are never stored. `captureUid` is chosen by the recording browser
 * and makes retries idempotent: the same capture sent twice is stored once.
 */
export const attempts = sqliteTable(
  "attempts",
  {
    id: id(),
    captureUid: text("capture_uid").notNull().unique(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "cascade" }),
    motion: text("motion").notNull(),
    side: text("side", { enum: SIDES }).notNull(),
    digit: text("digit", { enum: DIGIT_NAMES }),
    condition: text("condition", { enum: CONDITIONS }).notNull(),
    source: text("source", { enum: ATTEMPT_SOURCES }).notNull(),
    visitId: text("visit_id").references(() => visits.id, { onDelete: "set null" }),
    practiceSessionId: text("practice_session_id"),
    recordedByUserId: text("recorded_by_user_id").references(() => users.id, { onDelete: "set null" }),
    recordedAt: integer("recorded_at", { mode: "timestamp_ms" }).notNull(),
    frames: integer("frames").notNull(),
    usableFrames: integer("usable_frames").notNull(),
    reps: integer("reps").notNull(),
    startDeg: real("start_deg"),
    peakDeg: real("peak_deg"),
    arcDeg: real("arc_deg"),
    /** ± degrees, from the validation error for this joint and view and from tracking confidence. */
    uncertaintyDeg: real("uncertainty_deg"),
    planeVerdict: text("plane_verdict").notNull(),
    axisToGravityDeg: real("axis_to_gravity_deg"),
    /** The plane check agreed with the declared condition. */
    planeVerified: integer("plane_verified", { mode: "boolean" }).notNull(),
    method: text("method"),
    /** The camera view most frames saw (vision/view-policy.ts), how it serves this motion, and the wrist's forearm line. */
    cameraView: text("camera_view"),
    viewQuality: text("view_quality"),
    forearmSource: text("forearm_source"),
    /** The therapist asked for the finger on its own, the others held straight: read with the single-finger error. */
    oneFinger: integer("one_finger", { mode: "boolean" }).notNull().default(false),
    engineVersion: text("engine_version").notNull(),
    correctionVersion: text("correction_version"),
    warnings: text("warnings", { mode: "json" }).$type<string[]>().notNull().default(sql`'[]'`),
    /** The therapist kept this attempt as counting towards a grade. */
    keptAt: integer("kept_at", { mode: "timestamp_ms" }),
    keptByUserId: text("kept_by_user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [
    index("attempts_client_motion_idx").on(t.clientId, t.motion, t.side, t.digit),
    // Covers the chart's change stamp (count, kept count, newest) so a cached chart is checked without reading rows.
    index("attempts_client_stamp_idx").on(t.clientId, t.createdAt, t.keptAt),
    index("attempts_clinic_idx").on(t.clinicId),
    index("attempts_visit_idx").on(t.visitId),
  ],
);

/** The raw capture file (gzip of the JSON), kept so any attempt can be re-analyzed by a later engine. */
export const attemptCaptures = sqliteTable("attempt_captures", {
  attemptId: text("attempt_id")
    .primaryKey()
    .references(() => attempts.id, { onDelete: "cascade" }),
  gzip: blob("gzip", { mode: "buffer" }).notNull(),
  sha256: text("sha256").notNull(),
  bytes: integer("bytes").notNull(),
});

/** Passive range measured by the therapist (goniometer); becomes the reference for "full range". */
export const passiveRanges = sqliteTable(
  "passive_ranges",
  {
    id: id(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "cascade" }),
    motion: text("motion").notNull(),
    side: text("side", { enum: SIDES }).notNull(),
    digit: text("digit", { enum: DIGIT_NAMES }),
    valueDeg: real("value_deg").notNull(),
    measuredAt: integer("measured_at", { mode: "timestamp_ms" }).notNull(),
    measuredByUserId: text("measured_by_user_id").references(() => users.id, { onDelete: "set null" }),
    note: text("note").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [index("passive_ranges_client_motion_idx").on(t.clientId, t.motion, t.side, t.digit)],
);

export const GRADE_METHODS = ["remote_range", "in_person_resisted", "in_person_palpation"] as const;
export const GRADE_STATUSES = ["awaiting_cosign", "signed"] as const;

/**
 * A muscle grade as recorded. Never edited once signed: a correction is a new row whose `replacesId` points at the
 * row it corrects, and both stay visible.
 */
export const gradeEntries = sqliteTable(
  "grade_entries",
  {
    id: id(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "cascade" }),
    motion: text("motion").notNull(),
    side: text("side", { enum: SIDES }).notNull(),
    digit: text("digit", { enum: DIGIT_NAMES }),
    scale: text("scale", { enum: ["daniels", "mrc", "intrinsic"] }).notNull(),
    /** e.g. "3-", "4", "0"; null when no grade could be given (no motion seen remotely). */
    value: text("value"),
    method: text("method", { enum: GRADE_METHODS }).notNull(),
    /** What the grade rests on: attempt ids, reference end-range and its source, thresholds. */
    basis: text("basis", { mode: "json" }).$type<Record<string, unknown>>(),
    /** Reasons an in-person test is still needed when this grade was made (resistance, palpation, …). */
    inPersonReasons: text("in_person_reasons", { mode: "json" }).$type<string[]>().notNull().default(sql`'[]'`),
    visitId: text("visit_id").references(() => visits.id, { onDelete: "set null" }),
    note: text("note").notNull().default(""),
    recordedByUserId: text("recorded_by_user_id").references(() => users.id, { onDelete: "set null" }),
    recordedByRole: text("recorded_by_role").notNull(),
    recordedAt: integer("recorded_at", { mode: "timestamp_ms" }).notNull(),
    status: text("status", { enum: GRADE_STATUSES }).notNull(),
    signedByUserId: text("signed_by_user_id").references(() => users.id, { onDelete: "set null" }),
    signedAt: integer("signed_at", { mode: "timestamp_ms" }),
    replacesId: text("replaces_id"),
  },
  (t) => [
    index("grades_client_motion_idx").on(t.clientId, t.motion, t.side, t.digit),
    index("grades_clinic_status_idx").on(t.clinicId, t.status),
    index("grades_replaces_idx").on(t.replacesId),
  ],
);

export const STRENGTH_TESTS = ["grip", "tip_pinch", "key_pinch", "palmar_pinch"] as const;
export type StrengthTest = (typeof STRENGTH_TESTS)[number];

/**
 * In-person dynamometer (grip) and pinch-gauge readings. Stored in kilograms-force, the mean of the trials as the
 * norms are (Mathiowetz et al. 1985: mean of three trials); the trials are kept so the mean can be checked.
 */
export const strengthReadings = sqliteTable(
  "strength_readings",
  {
    id: id(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "cascade" }),
    test: text("test", { enum: STRENGTH_TESTS }).notNull(),
    side: text("side", { enum: SIDES }).notNull(),
    trialsKg: text("trials_kg", { mode: "json" }).$type<number[]>().notNull(),
    meanKg: real("mean_kg").notNull(),
    /** Dynamometer handle position (1-5); the norms use position 2. */
    handlePosition: integer("handle_position"),
    visitId: text("visit_id").references(() => visits.id, { onDelete: "set null" }),
    note: text("note").notNull().default(""),
    recordedByUserId: text("recorded_by_user_id").references(() => users.id, { onDelete: "set null" }),
    recordedAt: integer("recorded_at", { mode: "timestamp_ms" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index("strength_readings_client_idx").on(t.clientId, t.test, t.side),
    index("strength_readings_clinic_idx").on(t.clinicId),
    index("strength_readings_visit_idx").on(t.visitId),
  ],
);

export const clinicsRelations = relations(clinics, ({ many }) => ({ users: many(users), clients: many(clients) }));
export const usersRelations = relations(users, ({ one }) => ({
  clinic: one(clinics, { fields: [users.clinicId], references: [clinics.id] }),
}));
export const clientsRelations = relations(clients, ({ one }) => ({
  clinic: one(clinics, { fields: [clients.clinicId], references: [clinics.id] }),
  user: one(users, { fields: [clients.userId], references: [users.id] }),
  primaryTherapist: one(users, { fields: [clients.primaryTherapistId], references: [users.id] }),
}));

export type Clinic = typeof clinics.$inferSelect;
export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;
export type Client = typeof clients.$inferSelect;
export type NewClient = typeof clients.$inferInsert;
export type AuditEvent = typeof auditEvents.$inferSelect;


export type Visit = typeof visits.$inferSelect;
export type Attempt = typeof attempts.$inferSelect;
export type NewAttempt = typeof attempts.$inferInsert;
export type GradeEntry = typeof gradeEntries.$inferSelect;
export type PassiveRange = typeof passiveRanges.$inferSelect;
export type Consent = typeof consents.$inferSelect;
export type StrengthReading = typeof strengthReadings.$inferSelect;

// ---------------------------------------------------------------------------------------------------------------
// Uploads, payments and safeguards.

export const UPLOAD_KINDS = ["clip", "document"] as const;
export type UploadKind = (typeof UPLOAD_KINDS)[number];

/**
 * A file a client or staff member sent: a short clip of a motion or a document (referral letter, photo). The bytes
 * live in the storage backend (lib/storage) under `storageKey`; the type is the one found from the content, never
 * the name. `uploadUid` is chosen by the sending browser so a retried upload is stored once.
 */
export const uploads = sqliteTable(
  "uploads",
  {
    id: id(),
    uploadUid: text("upload_uid").notNull().unique(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: UPLOAD_KINDS }).notNull(),
    /** Detected from the magic bytes, e.g. video/webm, application/pdf. */
    mediaType: text("media_type").notNull(),
    extension: text("extension").notNull(),
    /** The sender's file name, for display only. */
    originalName: text("original_name").notNull(),
    bytes: integer("bytes").notNull(),
    sha256: text("sha256").notNull(),
    storageKey: text("storage_key").notNull(),
    note: text("note").notNull().default(""),
    /** Clips: the motion the client meant to show (lib/motions ids). */
    motion: text("motion"),
    side: text("side", { enum: SIDES }),
    digit: text("digit", { enum: DIGIT_NAMES }),
    /** Clips: the attempt made by analyzing the clip, once analyzed. */
    attemptId: text("attempt_id").references(() => attempts.id, { onDelete: "set null" }),
    uploadedByUserId: text("uploaded_by_user_id").references(() => users.id, { onDelete: "set null" }),
    uploadedByRole: text("uploaded_by_role").notNull(),
    reviewedAt: integer("reviewed_at", { mode: "timestamp_ms" }),
    reviewedByUserId: text("reviewed_by_user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [
    index("uploads_client_idx").on(t.clientId, t.createdAt),
    index("uploads_clinic_idx").on(t.clinicId),
    index("uploads_attempt_idx").on(t.attemptId),
    index("uploads_uploader_idx").on(t.uploadedByUserId),
    index("uploads_reviewer_idx").on(t.reviewedByUserId),
  ],
);

/** The self-pay price of one visit of a kind, in the currency's minor unit (cents). One row per clinic and kind. */
export const visitPrices = sqliteTable(
  "visit_prices",
  {
    id: id(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "cascade" }),
    visitKind: text("visit_kind", { enum: VISIT_KINDS }).notNull(),
    amountMinor: integer("amount_minor").notNull(),
    /** ISO 4217, lower case as the payment service writes it (e.g. "usd", "eur"). */
    currency: text("currency").notNull(),
    label: text("label").notNull(),
    updatedByUserId: text("updated_by_user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("visit_prices_clinic_kind_idx").on(t.clinicId, t.visitKind), index("visit_prices_updater_idx").on(t.updatedByUserId)],
);

export const PAYMENT_STATUSES = ["pending", "paid", "refunded", "expired"] as const;
export type PaymentStatus = (typeof PAYMENT_STATUSES)[number];

/**
 * One checkout for one visit. Kinarc keeps only the payment service's ids and the amount: no card data ever reaches
 * it. The status moves only on signed webhooks (and the admin's refund), never on the browser's word.
 */
export const payments = sqliteTable(
  "payments",
  {
    id: id(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    visitId: text("visit_id")
      .notNull()
      .references(() => visits.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "restrict" }),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    status: text("status", { enum: PAYMENT_STATUSES }).notNull().default("pending"),
    checkoutSessionId: text("checkout_session_id").notNull().unique(),
    checkoutUrl: text("checkout_url"),
    paymentIntentId: text("payment_intent_id"),
    refundId: text("refund_id"),
    paidAt: integer("paid_at", { mode: "timestamp_ms" }),
    refundedAt: integer("refunded_at", { mode: "timestamp_ms" }),
    receiptSentAt: integer("receipt_sent_at", { mode: "timestamp_ms" }),
    createdByUserId: text("created_by_user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("payments_visit_idx").on(t.visitId),
    index("payments_client_idx").on(t.clientId),
    index("payments_clinic_idx").on(t.clinicId, t.status),
    index("payments_creator_idx").on(t.createdByUserId),
  ],
);

/** Webhook events already handled, so a redelivered event changes nothing twice. */
export const paymentEvents = sqliteTable("payment_events", {
  eventId: text("event_id").primaryKey(),
  type: text("type").notNull(),
  receivedAt: integer("received_at", { mode: "timestamp_ms" }).notNull(),
});

/** Staff activity for sign-out after inactivity (STAFF_IDLE_MINUTES), touched by the guard at most once a minute. */
export const staffActivity = sqliteTable("staff_activity", {
  userId: text("user_id")
    .primaryKey()
    .references(() => users.id, { onDelete: "cascade" }),
  lastActiveAt: integer("last_active_at", { mode: "timestamp_ms" }).notNull(),
});

/** A client's erasure on request: when, by whom, and what was removed and kept (counts), for the clinic's records. */
export const clientErasures = sqliteTable(
  "client_erasures",
  {
    id: id(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .unique()
      .references(() => clients.id, { onDelete: "restrict" }),
    requestedAt: integer("requested_at", { mode: "timestamp_ms" }).notNull(),
    erasedAt: integer("erased_at", { mode: "timestamp_ms" }).notNull(),
    erasedByUserId: text("erased_by_user_id").references(() => users.id, { onDelete: "set null" }),
    summary: text("summary", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
  },
  (t) => [index("client_erasures_clinic_idx").on(t.clinicId), index("client_erasures_by_idx").on(t.erasedByUserId)],
);

export type Upload = typeof uploads.$inferSelect;
export type VisitPrice = typeof visitPrices.$inferSelect;
export type Payment = typeof payments.$inferSelect;
export type ClientErasure = typeof clientErasures.$inferSelect;

// ---------------------------------------------------------------------------------------------------------------
// Home practice between visits. Practice attempts are ordinary attempts with `source: "practice"` and the session's id
// in `attempts.practice_session_id`; they inform the therapist and never become grades.

export const PRACTICE_PERIODS = ["day", "week"] as const;
export type PracticePeriod = (typeof PRACTICE_PERIODS)[number];

/** One motion a therapist or assistant assigned to a client to practise at home, how often and until when. */
export const homeProgramItems = sqliteTable(
  "home_program_items",
  {
    id: id(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "cascade" }),
    motion: text("motion").notNull(),
    side: text("side", { enum: SIDES }).notNull(),
    digit: text("digit", { enum: DIGIT_NAMES }),
    condition: text("condition", { enum: CONDITIONS }).notNull(),
    /** Movements per session. */
    repetitions: integer("repetitions").notNull(),
    /** Sessions due in each `period`. */
    sessionsPerPeriod: integer("sessions_per_period").notNull(),
    period: text("period", { enum: PRACTICE_PERIODS }).notNull(),
    /** Inclusive local dates (clinic time zone), YYYY-MM-DD. */
    startDate: text("start_date").notNull(),
    endDate: text("end_date").notNull(),
    notes: text("notes").notNull().default(""),
    assignedByUserId: text("assigned_by_user_id").references(() => users.id, { onDelete: "set null" }),
    /** Ended before its end date; kept so past adherence still reads against what was asked. */
    endedAt: integer("ended_at", { mode: "timestamp_ms" }),
    endedByUserId: text("ended_by_user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("home_program_items_client_idx").on(t.clientId),
    index("home_program_items_clinic_idx").on(t.clinicId),
    index("home_program_items_assigned_by_idx").on(t.assignedByUserId),
    index("home_program_items_ended_by_idx").on(t.endedByUserId),
  ],
);

/**
 * One sitting of practice of one program item. The id is chosen by the client's browser when the sitting starts and
 * travels with each attempt, so attempts kept offline and sent later still join their sitting, exactly once.
 */
export const practiceSessions = sqliteTable(
  "practice_sessions",
  {
    id: text("id").primaryKey(),
    clinicId: text("clinic_id")
      .notNull()
      .references(() => clinics.id, { onDelete: "restrict" }),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "cascade" }),
    itemId: text("item_id")
      .notNull()
      .references(() => homeProgramItems.id, { onDelete: "cascade" }),
    /** The first attempt's recording time. */
    startedAt: integer("started_at", { mode: "timestamp_ms" }).notNull(),
    /** The clinic-local date of `startedAt`, YYYY-MM-DD, which is what counts towards a day or week. */
    localDate: text("local_date").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("practice_sessions_client_date_idx").on(t.clientId, t.localDate), index("practice_sessions_item_idx").on(t.itemId), index("practice_sessions_clinic_idx").on(t.clinicId)],
);

export type HomeProgramItem = typeof homeProgramItems.$inferSelect;
export type PracticeSession = typeof practiceSessions.$inferSelect;
