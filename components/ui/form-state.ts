export { IDLE_FORM_STATE as IDLE_STATE, type FormState } from "@/lib/form-state";
