import type { BuildFigures } from '@shared/build/figures'
import type { BuildPlanInput, BuildStepDoneBody, BuildTemplate, PublicBuild } from '@shared/schemas/build'
import type { LivestockAdded } from '@shared/schemas/care-api'
import { http } from './client'
import { ApiError } from './errors'
import { fileNameOf, saveFile } from './save-file'

/** The tank's build, or null when none has been planned yet. */
export async function getBuild(tankId: number): Promise<PublicBuild | null> {
  try {
    return (await http.get<PublicBuild>(`/tanks/${tankId}/build`)).data
  } catch (error) {
    if (error instanceof ApiError && error.status === 404 && error.code === 'not_found' && /build/.test(error.message)) return null
    throw error
  }
}

export async function saveBuildPlan(tankId: number, plan: BuildPlanInput): Promise<PublicBuild & { figures: BuildFigures }> {
  return (await http.put<PublicBuild & { figures: BuildFigures }>(`/tanks/${tankId}/build/plan`, plan)).data
}

export async function startBuild(tankId: number, filledOn: string): Promise<PublicBuild> {
  return (await http.post<PublicBuild>(`/tanks/${tankId}/build/start`, { filledOn })).data
}

export async function tickBuildStep(tankId: number, key: string, input: BuildStepDoneBody = {}): Promise<{ build: PublicBuild; livestock: LivestockAdded[] }> {
  return (await http.post<{ build: PublicBuild; livestock: LivestockAdded[] }>(`/tanks/${tankId}/build/steps/${key}/done`, input)).data
}

export async function getBuildTemplates(tankId: number): Promise<BuildTemplate[]> {
  return (await http.get<BuildTemplate[]>(`/tanks/${tankId}/build/templates`)).data
}

export async function downloadBuildReport(tankId: number): Promise<string> {
  const res = await http.get<Blob>(`/tanks/${tankId}/build/report/pdf`, { responseType: 'blob' })
  const filename = fileNameOf(res.headers['content-disposition'], 'build-report.pdf')
  saveFile(res.data, filename)
  return filename
}

export async function mailBuildReport(tankId: number, emails: string[]): Promise<{ queued: number }> {
  return (await http.post<{ queued: number }>(`/tanks/${tankId}/build/report/mail`, { emails })).data
}
