export { getJobEnd, setLogistics, moveJobCustody, keepPolisher, addNote, addProgressPhotos, sharePhoto, publicJobs, publicPhotoFile } from './job-end';
export { createVariation, sendVariation, withdrawVariation, publicVariation, answerVariation } from './variations';
