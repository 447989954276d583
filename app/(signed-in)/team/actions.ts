"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { getStaffMember, updateStaffMember } from "@/db/queries/users";
import { guardedAction, type FormState } from "@/lib/actions";
import { auditActorEvent } from "@/lib/audit";
import { inviteStaff } from "@/lib/staff";
import { formDataToObject } from "@/lib/validation/common";
import { changeRoleSchema, inviteStaffSchema, setActiveSchema } from "@/lib/validation/staff";
import { AccessError, NOT_FOUND } from "@/lib/auth/guard";

const ADMIN = ["admin"] as const;

export async function inviteStaffAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const values = formDataToObject(formData);
  const state = await guardedAction(ADMIN, async (actor) => {
    const input = inviteStaffSchema.parse(values);
    await inviteStaff(getDb(), actor, input);
    return { ok: true, message: `Invitation sent to ${input.email}.` };
  });
  revalidatePath("/team");
  return state.ok ? state : { ...state, values };
}

export async function changeRoleAction(_prev: FormState, formData: FormData): Promise<FormState> {
  return guardedAction(ADMIN, async (actor) => {
    const input = changeRoleSchema.parse(formDataToObject(formData));
    const db = getDb();
    const member = await getStaffMember(db, actor.clinicId, input.userId);
    if (!member) throw new AccessError(404, NOT_FOUND);
    if (member.id === actor.userId && input.role !== "admin") return { ok: false, message: "You cannot remove your own admin role; ask another admin." };
    await db.transaction(async (tx) => {
      await updateStaffMember(tx, actor.clinicId, member.id, { role: input.role });
      await auditActorEvent(tx, actor, { action: "staff.role_change", subjectType: "user", subjectId: member.id, detail: { from: member.role, to: input.role } });
    });
    revalidatePath("/team");
    return { ok: true, message: `${member.name ?? member.email} is now ${input.role === "admin" ? "an admin" : `a ${input.role}`}.` };
  });
}

export async function setActiveAction(_prev: FormState, formData: FormData): Promise<FormState> {
  return guardedAction(ADMIN, async (actor) => {
    const input = setActiveSchema.parse(formDataToObject(formData));
    const db = getDb();
    const member = await getStaffMember(db, actor.clinicId, input.userId);
    if (!member) throw new AccessError(404, NOT_FOUND);
    if (member.id === actor.userId) return { ok: false, message: "You cannot deactivate your own account." };
    await db.transaction(async (tx) => {
      await updateStaffMember(tx, actor.clinicId, member.id, { active: input.active });
      await auditActorEvent(tx, actor, { action: input.active ? "staff.reactivate" : "staff.deactivate", subjectType: "user", subjectId: member.id });
    });
    revalidatePath("/team");
    return { ok: true, message: `${member.name ?? member.email} ${input.active ? "can sign in again" : "can no longer sign in"}.` };
  });
}
